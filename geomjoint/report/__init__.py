"""Reports: terminal table, JSON document, HTML."""
