#!/usr/bin/env bash
# Rebuilds the compiled lexicons embedded in the binary from their TSV sources.
# Run after changing a TSV in lexicons/ or the normalization (normalize, case,
# fold) of the rule-set a lexicon is built for; tests/compiled_lexicons.rs
# fails while one is stale. The source lists must match COMPILED in
# src/lexicon/bundled.rs.
#
# The Sanskrit lexicon has no TSV: `juncture lexicon expand` (no arguments)
# generates it from lexicons/sanskrit/ and lexicons/sanskrit-sandhi-stems.tsv
# (src/lexicon/sanskrit.rs), into a temporary file that is then compiled like
# the others. Its name, sanskrit-generated.tsv, is recorded as the source
# (SANSKRIT_GENERATED_TSV in src/lexicon/bundled.rs). Rerun after changing
# those files or the generator.
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
j=target/release/juncture
build() { # name rules tsv...
  local name=$1 rules=$2; shift 2
  "$j" lexicon build "$@" --rules "$rules" -o "lexicons/compiled/$name.jlex"
}
build german german lexicons/german.tsv
build dutch dutch lexicons/dutch.tsv
build swedish swedish lexicons/swedish.tsv lexicons/swedish-closed-class.tsv
build danish danish lexicons/danish.tsv lexicons/danish-closed-class.tsv
build norwegian norwegian lexicons/norwegian.tsv lexicons/norwegian-closed-class.tsv
tmp=$(mktemp -d)
trap 'rm -rf "$tmp"' EXIT
"$j" lexicon expand -o "$tmp/sanskrit-generated.tsv"
build sanskrit sanskrit "$tmp/sanskrit-generated.tsv"
