#!/usr/bin/env python3
"""Writes the seed corpus of every fuzz target into fuzz/corpus/<target>/seed-*.
Run from the repository root after `cargo build --release` (it asks the
binary for the bundled rule-sets and builds small compiled lexicons)."""
import glob, os, re, subprocess, tempfile

B = "target/release/juncture"
OUT = "fuzz/corpus"


def put(target, name, data):
    d = os.path.join(OUT, target)
    os.makedirs(d, exist_ok=True)
    if isinstance(data, str):
        data = data.encode()
    with open(os.path.join(d, "seed-" + re.sub(r"[^A-Za-z0-9_.-]", "_", name)), "wb") as f:
        f.write(data)


# rules_compile: every bundled rule file and the malformed test files.
for path in sorted(glob.glob("rule-sets/*.jr")) + sorted(glob.glob("tests/data/malformed/*.jr")):
    put("rules_compile", os.path.basename(path), open(path, "rb").read())

# The bundled rule-sets in the order split_bytes indexes them.
names = [l.split()[0] for l in subprocess.run([B, "rules"], capture_output=True, text=True).stdout.splitlines()[1:] if l.strip()]

# lexicon_tsv: selector byte (rule-set 0..3; +0x80 strict) then TSV text.
put("lexicon_tsv", "demo", b"\x00" + open("lexicons/demo.tsv", "rb").read())
german = open("lexicons/german.tsv", "rb").read()
put("lexicon_tsv", "german-head", b"\x03" + german[: german.find(b"\n", 3000) + 1])
put("lexicon_tsv", "odd-lines", b"\x01" + "Essen\t30\tpos=noun\nessen\t50\tpos=verb\n# c\n\nHaus\n\ufeffx\t1\r\nbad\tx\n\tleer\nk\t1\tnotag\nz\t-1\nq\tinf\nn\t1e308\t\nm\t1\ta=b;c=d;;e=\nt\t2\tk=v\textra\n".encode() + b"\xff\xfe\n")
put("lexicon_tsv", "sanskrit", b"\x02deva\t10\tpos=noun\nindra\t5\tpos=noun\ntat\t7\nna\t3\n")

# lexicon_compiled: small compiled lexicons.
with tempfile.TemporaryDirectory() as tmp:
    for rules, tsv in [("demo", "lexicons/demo.tsv"), ("german", None)]:
        src = tsv
        if src is None:
            src = os.path.join(tmp, "g.tsv")
            open(src, "wb").write(german[: german.find(b"\n", 1500) + 1])
        out = os.path.join(tmp, rules + ".jlex")
        subprocess.run([B, "lexicon", "build", "--rules", rules, "-o", out, src], check=True, capture_output=True)
        put("lexicon_compiled", rules, open(out, "rb").read())
put("lexicon_compiled", "magic-only", b"JUNCLEX\x00")

# split_bytes: selector byte (rule-set index; +0x80 small lexicon; +0x40 tokens) then a surface.
for i, name in enumerate(names):
    text = subprocess.run([B, "rules", "show", name], capture_output=True, text=True).stdout
    surfaces = []
    for line in text.splitlines():
        m = re.match(r"\s*example\s+.*?(?:->|→|=>)\s*(.*?)\s*(?:\s#.*)?$", line)
        if m:
            surfaces.append(m.group(1))
    for j, s in enumerate(surfaces[:6]):
        sel = i | (0x80 if j % 2 else 0) | (0x40 if j % 3 == 0 else 0)
        put("split_bytes", f"{name}-{j}", bytes([sel]) + s.encode())
put("split_bytes", "odd", b"\x01tor\xffmek\x00\r\xe2\x80\xae\xcc\x81")
