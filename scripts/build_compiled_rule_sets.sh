#!/usr/bin/env bash
# Rebuilds the compiled rule-sets embedded in the binary from the rule files
# in rule-sets/. Run after changing a rule file, the compiler (src/rules/) or
# a type a compiled rule-set holds; tests/compiled_rule_sets.rs fails while
# one is stale (until then the binary compiles the stale one's text at
# start-up, which is correct but slow). The list must match COMPILED in
# src/rules/bundled.rs.
set -euo pipefail
cd "$(dirname "$0")/.."
cargo build --release --quiet
for name in plain demo german dutch swedish danish norwegian sanskrit; do
  target/release/juncture rules build "$name" -o "rule-sets/compiled/$name.jrc"
done
