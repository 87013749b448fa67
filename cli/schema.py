"""The JSON Schema of the check record (cli/check.schema.json, shipped with the package)."""

from __future__ import annotations

import json
from importlib import resources
from typing import Any

SCHEMA_FILE = "check.schema.json"


def check_schema() -> dict[str, Any]:
    """The JSON Schema (draft 2020-12) that every record of cli.record.check_record satisfies."""
    return json.loads(resources.files(__package__).joinpath(SCHEMA_FILE).read_text(encoding="utf-8"))
