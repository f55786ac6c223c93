"""The editor schema agrees with the loader: it accepts every loadable fixture and rejects format errors."""
import glob
import json
import os

import pytest
from ruamel.yaml import YAML

from ctllint.reading.loader import load_file
from ctllint.output.schema import build_schema

jsonschema = pytest.importorskip("jsonschema")
ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
GOOD = sorted(glob.glob(os.path.join(ROOT, "fixtures", "**", "*.ctl.yaml"), recursive=True))
BAD = sorted(glob.glob(os.path.join(ROOT, "tests", "data", "format-errors", "*.ctl.yaml")))


@pytest.fixture(scope="module")
def validator():
    schema = build_schema()
    jsonschema.Draft7Validator.check_schema(schema)
    return jsonschema.Draft7Validator(schema)


def as_data(path):
    yaml = YAML(typ="safe")
    with open(path, encoding="utf-8") as handle:
        return yaml.load(handle)


@pytest.mark.parametrize("path", GOOD, ids=lambda p: os.path.relpath(p, ROOT))
def test_schema_accepts_loadable_fixtures(validator, path):
    assert load_file(path).schematic is not None
    errors = [e.message for e in validator.iter_errors(as_data(path))]
    assert errors == []


@pytest.mark.parametrize("path", BAD, ids=os.path.basename)
def test_loader_and_schema_both_reject_format_errors(validator, path):
    with open(path, encoding="utf-8") as handle:
        want = int(handle.readline().split(":")[1])
    result = load_file(path)
    assert result.schematic is None
    assert want in [d.line for d in result.diagnostics]
    try:
        data = as_data(path)
    except Exception:  # the YAML itself is refused (duplicate key, object tag): rejected before any schema
        return
    assert list(validator.iter_errors(data)), "the schema accepted a file the loader refuses"


def test_schema_command_prints_json(capsys):
    from ctllint.commands.cli import main

    assert main(["schema"]) == 0
    doc = json.loads(capsys.readouterr().out)
    assert doc["$schema"].startswith("http://json-schema.org/draft-07")
