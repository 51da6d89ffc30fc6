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
}


def main():
    data = json.load(open(sys.argv[1]))
    print("Corpus: %d bytes of UTF-8 (every Europarl body).\n" % data["corpus_bytes"])
    print("| figure | value | unit |")
    print("|---|---:|---|")
    for k, v in data["figures"].items():
        print("| `%s` | %.3f | %s |" % (k, v, "s" if k.endswith("_s") else "MB/s"))
    print("\n| ratio | value | goal | met |")
    print("|---|---:|---|---|")
    for k, v in data["ratios"].items():
        goal = GOALS.get(k)
        if goal:
            op, x = goal
            met = v >= x if op == ">=" else v <= x
            print("| `%s` | %.3f | %s %g | %s |" % (k, v, op, x, "yes" if met else "**no**"))
        else:
            print("| `%s` | %.3f | (informative) | |" % (k, v))


if __name__ == "__main__":
    main()
