#!/usr/bin/python3
"""Wrap exiftool's JSON output in a self-describing table.

Usage: exiftool_json.py OUT.json GENERATOR NOTE BASEDIR [KEY=VALUE ...] < exiftool.json

Every "SourceFile" is rewritten relative to BASEDIR (a repaired copy's temp
path is mapped back to its original through REPAIRED_LIST, see below).
Values are kept exactly as exiftool printed them with -n (raw numbers).
"""
import json
import os
import subprocess
import sys

out, generator, note, base = sys.argv[1:5]
extra = dict(kv.split("=", 1) for kv in sys.argv[5:])
rows = json.load(sys.stdin)
# REPAIRED_LIST: lines "tmp_path<TAB>original_relative_path<TAB>what was done"
# for repaired copies. CHUNK_LIST: lines "relative_path<TAB>json object" of
# extra per-file facts (e.g. which PNG chunk carries the EXIF).
repaired = {}
if os.environ.get("REPAIRED_LIST"):
    with open(os.environ["REPAIRED_LIST"]) as f:
        for line in f:
            if line.strip():
                tmp, orig, how = line.rstrip("\n").split("\t")
                repaired[tmp] = (orig, how)
facts = {}
if os.environ.get("FACTS_LIST"):
    with open(os.environ["FACTS_LIST"]) as f:
        for line in f:
            if line.strip():
                name, obj = line.rstrip("\n").split("\t", 1)
                facts[name] = json.loads(obj)
files = []
for r in rows:
    src = r.pop("SourceFile")
    entry = {}
    if src in repaired:
        entry["file"], entry["repaired_copy"], entry["repair"] = repaired[src][0], True, repaired[src][1]
    else:
        entry["file"], entry["repaired_copy"] = os.path.relpath(src, base), False
    entry.update(facts.get(entry["file"], {}))
    entry["exiftool"] = r
    files.append(entry)
files.sort(key=lambda f: f["file"])
version = subprocess.run(["exiftool", "-ver"], capture_output=True, text=True, check=True).stdout.strip()
doc = {"generator": generator, "exiftool_version": version,
       "exiftool_command": os.environ.get("EXIFTOOL_CMD", ""), **extra,
       "note": note, "files": files}
with open(out, "w") as f:
    json.dump(doc, f, indent=1, ensure_ascii=False, sort_keys=False)
    f.write("\n")
print(f"{out}: {len(files)} files, exiftool {version}")
