#!/usr/bin/python3
"""Benchmark driver for pomegranate 0.14 (Debian python3-pomegranate), written for underfoot's
benchmark (bench/peers.ts runs it and feeds it on stdin). Not part of the product.

Reads one discrete HMM and its runs from stdin, in the format of test/bench/peers/ghmm-driver.c (the
last symbol is the dropout, with emission 1 in every state), and prints one line per operation:
`score <seconds> <sum of log P>` (log_probability of every run), `viterbi <seconds> <sum of path log P>`
(viterbi), `baum-welch <K> <seconds>` for each requested count K (K exact EM steps:
summarize(runs, algorithm="baum-welch") then from_summaries(inertia=0.0, pseudocount=0.0), continuing
from the previous count's model), then `rss-kb <peak resident set>`. Seconds are time.perf_counter
around the library calls only.

How pomegranate is made to compute a plain HMM (from DEVELOPERS.md, "Reference libraries and
peers"): one State per cell with a DiscreteDistribution, only the transitions that exist, none to
model.end (so the model has no end state), bake(merge="None") (the other merge modes may change the
topology), and zero-padded state names because bake sorts states by name.
Run with Debian's interpreter (/usr/bin/python3), the only one that sees python3-pomegranate.
"""

import resource
import sys
import time

from pomegranate import DiscreteDistribution, HiddenMarkovModel, State


def main():
    data = sys.stdin.read().split()
    pos = 0

    def take():
        nonlocal pos
        pos += 1
        return data[pos - 1]

    n = int(take())
    m = int(take())
    pi = [float(take()) for _ in range(n)]
    edges = []
    for i in range(n):
        k = int(take())
        for _ in range(k):
            j = int(take())
            edges.append((i, j, float(take())))
    emission = [[float(take()) for _ in range(m)] for _ in range(n)]
    n_runs = int(take())
    runs = []
    for _ in range(n_runs):
        length = int(take())
        runs.append([int(take()) for _ in range(length)])
    calls = [int(take()) for _ in range(int(take()))]

    model = HiddenMarkovModel()
    states = [State(DiscreteDistribution({r: emission[i][r] for r in range(m)}), name="c%05d" % i) for i in range(n)]
    model.add_states(*states)
    for i in range(n):
        if pi[i] > 0:
            model.add_transition(model.start, states[i], pi[i])
    for i, j, p in edges:
        model.add_transition(states[i], states[j], p)
    model.bake(merge="None")
    if [s.name for s in model.states[:n]] != ["c%05d" % i for i in range(n)]:
        sys.exit("pomegranate-driver: bake must keep the cell order, got another order")

    t0 = time.perf_counter()
    total = sum(model.log_probability(run) for run in runs)
    print("score %.9f %.17g" % (time.perf_counter() - t0, total), flush=True)

    t0 = time.perf_counter()
    paths = sum(model.viterbi(run)[0] for run in runs)
    print("viterbi %.9f %.17g" % (time.perf_counter() - t0, paths), flush=True)

    for iterations in calls:
        t0 = time.perf_counter()
        for _ in range(iterations):
            model.summarize(runs, algorithm="baum-welch")
            model.from_summaries(inertia=0.0, pseudocount=0.0)
        print("baum-welch %d %.9f" % (iterations, time.perf_counter() - t0), flush=True)
    print("rss-kb %d" % resource.getrusage(resource.RUSAGE_SELF).ru_maxrss, flush=True)


main()
