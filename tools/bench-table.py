#!/usr/bin/env python3
"""Renders tokenize-bench/target/bench-summary.json as the Markdown tables of docs/benchmarks.md.

    python3 tools/bench-table.py tokenize-bench/target/bench-summary.json
"""
import json
import sys

GOALS = {
    "split_vs_utf8": (">=", 0.15),
    "bpe_vs_split": (">=", 0.5),
    "bpe_vs_textbook": (">=", 10),
    "wordpiece_vs_split": (">=", 0.6),
    "unigram_vs_split": (">=", 0.25),
    "bpe_adversarial_vs_prose": ("<=", 3),
    "wordpiece_adversarial_vs_prose": ("<=", 3),
    "unigram_adversarial_vs_prose": ("<=", 3),
    "bpe_adversarial_scale": ("<=", 12),
    "wordpiece_adversarial_scale": ("<=", 12),
    "unigram_adversarial_scale": ("<=", 12),
    "batch_2_vs_1": (">=", 1.8),
    "bpe_train_vs_count": ("<=", 15),
    "lucene_vs_bpe": (">=", 0.7),
    "bpe_vs_ideal": (">=", 0.7),
    "wordpiece_vs_ideal": (">=", 0.8),
    "unigram_vs_ideal": (">=", 0.5),
    "bpe_cache_gain": (">=", 1.0),
    "bytes_vs_string_bpe": (">=", 1.0),
    "fresh_threads_bpe_vs_1thread": (">=", 0.8),
    "fresh_threads_wordpiece_vs_1thread": (">=", 0.8),
    "fresh_threads_unigram_vs_1thread": (">=", 0.8),
    "vthreads_bpe_vs_2threads": (">=", 0.8),
    "vthreads_wordpiece_vs_2threads": (">=", 0.8),
    "vthreads_unigram_vs_2threads": (">=", 0.8),
}
for _scheme in ("bpe", "wordpiece", "unigram"):
    for _kind in ("marks", "emoji", "mixed"):
        GOALS["%s_adversarial_%s_scale" % (_scheme, _kind)] = ("<=", 12)

# goals on figures themselves (memory figures have absolute bounds)
FIGURE_GOALS = {
    "first_encode_bytes_bpe": ("<=", 32768),
    "first_encode_bytes_wordpiece": ("<=", 32768),
    "first_encode_bytes_unigram": ("<=", 32768),
    "reload_retained_kib": ("<=", 40),
}


def unit(name):
    if name.endswith("_ms"):
        return "ms"
    if name.endswith("_s"):
        return "s"
    if name.startswith("first_encode_bytes_"):
        return "bytes"
    if name.endswith("_kib"):
        return "KiB"
    return "MB/s"


def met(goal, v):
    op, x = goal
    return v >= x if op == ">=" else v <= x


def main():
    data = json.load(open(sys.argv[1]))
    print("Corpus: %d bytes of UTF-8 (every Europarl body).\n" % data["corpus_bytes"])
    print("| figure | value | unit | goal |")
    print("|---|---:|---|---|")
    for k, v in data["figures"].items():
        goal = FIGURE_GOALS.get(k)
        g = "%s %g (%s)" % (goal[0], goal[1], "met" if met(goal, v) else "**not met**") if goal else ""
        print("| `%s` | %.3f | %s | %s |" % (k, v, unit(k), g))
    print("\n| ratio | value | goal | met |")
    print("|---|---:|---|---|")
    for k, v in data["ratios"].items():
        goal = GOALS.get(k)
        if goal:
            op, x = goal
            print("| `%s` | %.3f | %s %g | %s |" % (k, v, op, x, "yes" if met(goal, v) else "**no**"))
        else:
            print("| `%s` | %.3f | (informative) | |" % (k, v))
    notes = data.get("notes") or {}
    if notes:
        print("\nNotes:\n")
        for k, v in notes.items():
            print("- `%s`: %s" % (k, v))


if __name__ == "__main__":
    main()
