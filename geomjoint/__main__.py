from geomjoint.cli import entry

raise SystemExit(entry())
