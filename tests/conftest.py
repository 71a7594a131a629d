"""Shared test helpers."""
import json
import os
from pathlib import Path

#: the JSON Schemas of the contracts live in the shared folder beside the repository
#: (CI lays a copy of it beside the clone; GEOMJOINT_SCHEMAS points elsewhere, e.g. from a worktree)
SCHEMA_DIR = Path(os.environ.get("GEOMJOINT_SCHEMAS") or Path(__file__).resolve().parents[2] / "shared" / "schemas")

#: the project's own copy of the result schema: the contract plus the fields geomjoint adds
PROJECT_SCHEMA_DIR = Path(__file__).resolve().parent / "schemas"


def load_project_schema(name: str) -> dict:
    return json.loads((PROJECT_SCHEMA_DIR / name).read_text())


def load_schema(name: str) -> dict:
    path = SCHEMA_DIR / name
    if not path.exists():
        raise FileNotFoundError(f"contract schema {path} is missing: the shared folder must lie beside the repository")
    return json.loads(path.read_text())


def validate_result(doc: dict) -> None:
    """A result document against the shared contract and against the project's own copy."""
    import jsonschema

    jsonschema.validate(doc, load_schema("result.schema.json"))
    jsonschema.validate(doc, load_project_schema("result.schema.json"))
