"""Shared test helpers."""
import json
from pathlib import Path

#: the JSON Schemas of the contracts live in the shared folder beside the repository
#: (CI lays a copy of it beside the clone)
SCHEMA_DIR = Path(__file__).resolve().parents[2] / "shared" / "schemas"


def load_schema(name: str) -> dict:
    path = SCHEMA_DIR / name
    if not path.exists():
        raise FileNotFoundError(f"contract schema {path} is missing: the shared folder must lie beside the repository")
    return json.loads(path.read_text())
