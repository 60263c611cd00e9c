#!/usr/bin/env python3
"""The beam file's JSON Schema against trivet's reader.

Every examples/*.json, references/cases/*.json "beam", tests/data/good and
tests/corpus/good file is valid by the schema and accepted by `trivet check`
(exit 0 or 1); every tests/corpus/bad and tests/corpus/fuzz-found file the
reader refuses (exit 2) is refused by the schema too, except the files in
EXCEPTIONS: rules the schema cannot state. For those the test insists that
the schema does accept the file, so that the list stays exact.

The JSON text is read strictly, as the reader reads it (UTF-8, no duplicate
keys, no NaN or Infinity, no number beyond double): those are rules of the
text, not of the schema, and are counted as the schema refusing.

Exit 0: agree; 1: disagree; 77: python3-jsonschema is missing (skipped).
"""
import argparse, glob, json, math, os, subprocess, sys, tempfile

try:
    import jsonschema
    from jsonschema import Draft202012Validator
except ImportError:
    print("SKIP: python3-jsonschema is not installed (apt-get install python3-jsonschema); "
          "the schema was not checked", flush=True)
    sys.exit(77)

# File of tests/corpus/bad -> the reader's rule that JSON Schema cannot state.
EXCEPTIONS = {
    # One part of the file against another.
    "supports-too-few.json": "supports count = spans + 1",
    "supports-too-many.json": "supports count = spans + 1",
    "labels-too-few.json": "labels count = spans + 1",
    "load-on-a-nonexistent-span.json": "a span number exists",
    "load-span-beyond-64-bits.json": "a span number exists",
    "load-on-a-nonexistent-node.json": "a node number exists",
    "point-load-outside-its-span.json": "a position lies within its span",
    "point-load-negative-position.json": "a position lies within its span",
    "udl-beyond-its-span.json": "a position lies within its span",
    "udl-from-after-to.json": "'from' is less than 'to'",
    "udl-from-equals-to.json": "'from' is less than 'to'",
    "udl-shorter-than-rounding.json": "a distributed load is longer than 1e-12 of its span",
    "hinge-at-an-end.json": "a hinge is at an interior node",
    "couple-at-a-hinge.json": "no couple acts at a hinge",
    "mechanism-hinge-beside-pinned-end.json": "the arrangement is not a mechanism",
    "mechanism-all-supports-free.json": "the arrangement is not a mechanism",
    "mechanism-guided-alone.json": "the arrangement is not a mechanism",
    "mechanism-one-pin.json": "the arrangement is not a mechanism",
    "mechanism-guided-at-both-ends.json": "the arrangement is not a mechanism",
    "claim-on-a-nonexistent-node.json": "a claimed node exists",
    "claim-on-a-nonexistent-node-number.json": "a claimed node exists",
    "claim-on-a-nonexistent-span.json": "a claimed span exists",
    "claim-x-off-the-beam.json": "a claimed x lies on the beam",
    "claim-case-unknown.json": "a claimed case exists",
    "claim-case-needed.json": "a claim names its case when there are several",
    "claim-envelope-without-combination.json": "an envelope quantity names an envelope combination",
    "combination-unknown-case.json": "a combination's cases exist",
    "combination-factor-range-reversed.json": "a factor range is [low, high]",
    "combination-name-of-a-case.json": "combination names differ from case names",
    "combination-name-used-twice.json": "combination names are distinct",
    "combination-pattern-case-without-factor.json": "a patterned case has a factor",
    "preset-case-unknown.json": "a preset's cases exist",
    "moving-load-offsets-decreasing.json": "a moving load's offsets increase",
    "moving-load-all-points-zero.json": "a moving load has a point load that is not 0",
    "moving-load-name-of-a-case.json": "moving load names differ from case names",
    "combination-moving-load-factor-range.json": "a moving load takes one factor, not a range",
    "combination-moving-load-with-pattern.json": "a combination naming a moving load has no pattern",
    "combination-two-moving-loads.json": "a combination names at most one moving load",
    "claim-moving-load-not-an-envelope-quantity.json": "a claim on a moving load is of an envelope quantity",
    # Strings with their own unit: converted, then checked, by the reader only.
    "length-with-a-force-unit.json": "the dimension of a string with a unit",
    "udl-wrong-dimension.json": "the dimension of a string with a unit",
    "stiffness-e-zero.json": "the sign of a string with a unit",
}


class Refused(Exception):
    pass


def strict_load(data):
    """The reader's JSON text rules; Refused if they fail."""
    try:
        text = data.decode("utf-8")
    except UnicodeDecodeError as e:
        raise Refused("not UTF-8: %s" % e)

    def pairs(items):
        keys = [k for k, _ in items]
        if len(keys) != len(set(keys)):
            raise Refused("a key given twice")
        return dict(items)

    def constant(name):
        raise Refused("not JSON: " + name)

    def number(s):
        v = float(s)
        if not math.isfinite(v):
            raise Refused("a number beyond double")
        return v

    def depth(v, d=1):
        if d > 64:
            raise Refused("nested more than 64 levels")
        if isinstance(v, dict):
            for x in v.values():
                depth(x, d + 1)
        elif isinstance(v, list):
            for x in v:
                depth(x, d + 1)

    try:
        v = json.loads(text, object_pairs_hook=pairs, parse_constant=constant, parse_float=number)
    except (ValueError, RecursionError) as e:
        raise Refused("not valid JSON: %s" % e)
    depth(v)
    return v


def trivet_verdict(trivet, path):
    """True when the reader accepts the file: trivet exits 0 or 1, or exits 2
    only because no method can compute the accepted beam in double."""
    r = subprocess.run([trivet, "check", path, "--jobs", "1", "--json", "-"], stdout=subprocess.PIPE, stderr=subprocess.PIPE)
    if r.returncode not in (0, 1, 2):
        raise SystemExit("trivet check %s exited %d: %s" % (path, r.returncode, r.stderr.decode(errors="replace")))
    if r.returncode != 2:
        return True
    try:
        beams = json.loads(r.stdout.decode("utf-8"))["beams"]
    except (ValueError, KeyError):
        return False
    errors = [e for b in beams for e in b.get("errors", [])]
    return bool(errors) and all("no method could compute" in e.get("reason", "") for e in errors)


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--trivet", required=True)
    ap.add_argument("--schema", required=True)
    ap.add_argument("--root", required=True)
    a = ap.parse_args()

    with open(a.schema, "rb") as f:
        schema_bytes = f.read()
    schema = json.loads(schema_bytes)
    Draft202012Validator.check_schema(schema)
    validator = Draft202012Validator(schema)
    failures = []

    printed = subprocess.run([a.trivet, "schema"], stdout=subprocess.PIPE, check=True).stdout
    if printed != schema_bytes:
        failures.append("`trivet schema` does not print %s byte for byte" % a.schema)

    tmp = tempfile.mkdtemp(prefix="trivet-schema-")
    good = []
    for p in sorted(glob.glob(os.path.join(a.root, "examples", "*.json"))):
        good.append((p, p))
    for p in sorted(glob.glob(os.path.join(a.root, "references", "cases", "*.json"))):
        with open(p, "rb") as f:
            beam = json.load(f)["beam"]
        q = os.path.join(tmp, os.path.basename(p))
        with open(q, "w") as f:
            json.dump(beam, f)
        good.append((p + ' "beam"', q))
    for d in ("tests/data/good", "tests/corpus/good"):
        for p in sorted(glob.glob(os.path.join(a.root, d, "*.json"))):
            good.append((p, p))

    for name, path in good:
        with open(path, "rb") as f:
            data = f.read()
        try:
            errors = sorted(validator.iter_errors(strict_load(data)), key=lambda e: list(e.path))
        except Refused as e:
            errors = [e]
        for e in errors[:3]:
            failures.append("%s: the schema refuses a good file: %s at /%s" % (name, getattr(e, "message", e),
                            "/".join(str(x) for x in getattr(e, "path", []))))
        if not trivet_verdict(a.trivet, path):
            failures.append("%s: trivet refuses a good file" % name)

    bad = sorted(glob.glob(os.path.join(a.root, "tests", "corpus", "bad", "*.json")))
    bad += sorted(glob.glob(os.path.join(a.root, "tests", "corpus", "fuzz-found", "*.json")))
    if len(bad) < 60:
        failures.append("only %d bad files found" % len(bad))
    refused_by_both = excepted = 0
    for path in bad:
        name = os.path.basename(path)
        with open(path, "rb") as f:
            data = f.read()
        try:
            schema_ok = validator.is_valid(strict_load(data))
        except Refused:
            schema_ok = False
        reader_ok = trivet_verdict(a.trivet, path)
        if name in EXCEPTIONS and "fuzz-found" not in path:
            excepted += 1
            if reader_ok:
                failures.append("%s: listed as an exception, but trivet accepts it" % name)
            if not schema_ok:
                failures.append("%s: listed as an exception (%s), but the schema refuses it too: remove it from EXCEPTIONS"
                                % (name, EXCEPTIONS[name]))
        elif schema_ok != reader_ok:
            failures.append("%s: the reader %s it, the schema %s it" % (
                name, "accepts" if reader_ok else "refuses", "accepts" if schema_ok else "refuses"))
        elif not reader_ok:
            refused_by_both += 1
    for name in EXCEPTIONS:
        if not os.path.exists(os.path.join(a.root, "tests", "corpus", "bad", name)):
            failures.append("EXCEPTIONS names %s, which is not in tests/corpus/bad" % name)

    print("schema_check: %d good files valid and accepted; %d bad files refused by both; "
          "%d refused by the reader only (rules beyond JSON Schema)" % (len(good), refused_by_both, excepted))
    for f in failures:
        print("FAIL: " + f)
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
