#!/usr/bin/python3
"""Reference fixtures for the underfoot HMM engine, computed with pomegranate 0.14.

Builds random sparse discrete HMMs shaped like floor graphs (every cell has a dwell and
1-4 links, most two-way, some one-way), samples runs from each model, and records what
pomegranate computes for them: log-likelihood, posterior marginals, Viterbi path and the
parameters after exactly one Baum-Welch step over all runs of a case.

Every number is cross-checked against a small independent numpy implementation
(scaled forward-backward, log-space Viterbi, one Baum-Welch step) before the fixture is
written, so a broken fixture cannot be written.

Run with Debian's interpreter (the only one that sees python3-pomegranate):
    /usr/bin/python3 test/reference/make-pomegranate-fixtures.py
Writes test/reference/fixtures/pomegranate-hmm.json next to this script.

Sources for the algorithms used in the numpy cross-check:
  L. R. Rabiner, "A tutorial on hidden Markov models and selected applications in speech
  recognition", Proc. IEEE 77(2), 1989: scaled forward-backward (section V.A),
  Viterbi (section III.B), Baum-Welch re-estimation for several sequences (section V.B).
Source for the pomegranate API usage: DEVELOPERS.md, "Reference libraries and
peers", and pomegranate 0.14.8's hmm.pyx (installed with the Debian package).
"""

import json
import math
import os
import platform
import sys

import numpy as np
import pomegranate
from pomegranate import DiscreteDistribution, HiddenMarkovModel, State

SEED = 20240611
N_CASES = 6
# Keep the file small: at most this many posterior entries (steps x cells) per case.
POSTERIOR_BUDGET = 20000
LOGP_RTOL = 1e-10      # log P per run, relative (brief)
BW_ATOL = 1e-9         # one Baum-Welch step, absolute on probabilities (brief)
POST_ATOL = 1e-10      # posteriors, absolute
VIT_RTOL = 1e-10       # Viterbi log-probability, relative

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "fixtures", "pomegranate-hmm.json")


def cell_name(i):
    return "c%05d" % i


# ---------------------------------------------------------------- random models

def random_floor_graph(rng, n):
    """Directed links (no dwell) between n cells placed in the plane.

    A two-way nearest-neighbour tree keeps every cell reachable from every other; extra
    links to near cells are added, about a third of them one-way. Out-degree (without the
    dwell) stays within 1..4 for every cell.
    """
    pts = rng.uniform(0.0, 10.0, size=(n, 2))
    dist = np.sqrt(((pts[:, None, :] - pts[None, :, :]) ** 2).sum(axis=2))
    out = [set() for _ in range(n)]

    order = rng.permutation(n)
    placed = [order[0]]
    for i in order[1:]:
        # nearest already placed cell that still has room for one more link
        cand = sorted(placed, key=lambda j: dist[i, j])
        j = next(j for j in cand if len(out[j]) < 4)
        out[i].add(j)
        out[j].add(i)
        placed.append(i)

    target = rng.randint(1, 5, size=n)  # desired out-degree 1..4
    for i in range(n):
        near = [j for j in np.argsort(dist[i]) if j != i][:6]
        for j in near:
            if len(out[i]) >= target[i]:
                break
            if j in out[i]:
                continue
            if rng.uniform() < 0.35:
                out[i].add(j)                       # one-way i -> j
            elif len(out[j]) < 4:
                out[i].add(j)                       # two-way
                out[j].add(i)
    for i in range(n):
        assert 1 <= len(out[i]) <= 4, (i, out[i])
    return [sorted(int(j) for j in s) for s in out]


def random_case(rng, index):
    n = int(rng.randint(10, 61))
    m = int(rng.randint(3, 7))
    links = random_floor_graph(rng, n)

    # transitions: dwell + links, positive weights, rows normalised
    A = np.zeros((n, n))
    for i in range(n):
        A[i, i] = rng.uniform(0.5, 3.0)
        for j in links[i]:
            A[i, j] = rng.uniform(0.1, 1.0)
        A[i] /= A[i].sum()

    # start: all cells in some cases, a random subset in others
    if index % 3 == 0:
        support = np.arange(n)
    else:
        k = int(rng.randint(1, max(2, n // 3) + 1))
        support = np.sort(rng.choice(n, size=k, replace=False))
    pi = np.zeros(n)
    pi[support] = rng.uniform(0.2, 1.0, size=len(support))
    pi /= pi.sum()

    # emissions: every entry well above 1e-3, one favoured reading per cell
    B = rng.uniform(0.05, 1.0, size=(n, m))
    B[np.arange(n), rng.randint(0, m, size=n)] += rng.uniform(1.0, 4.0, size=n)
    B /= B.sum(axis=1, keepdims=True)
    assert B.min() > 1e-3

    # runs sampled from the model itself
    r = int(rng.randint(4, 9))
    lengths = rng.randint(20, 201, size=r)
    if lengths.sum() * n > POSTERIOR_BUDGET:
        scale = POSTERIOR_BUDGET / float(lengths.sum() * n)
        lengths = np.maximum(20, np.floor(lengths * scale)).astype(int)
    runs = []
    for T in lengths:
        s = rng.choice(n, p=pi)
        seq = []
        for t in range(int(T)):
            if t > 0:
                s = rng.choice(n, p=A[s])
            seq.append(int(rng.choice(m, p=B[s])))
        runs.append(seq)
    return n, m, pi, A, B, runs


# ---------------------------------------------------------------- pomegranate

def build_pomegranate(n, m, pi, A, B):
    model = HiddenMarkovModel(name="floor")
    states = []
    for i in range(n):
        dist = DiscreteDistribution({k: float(B[i, k]) for k in range(m)})
        states.append(State(dist, name=cell_name(i)))
    model.add_states(states)
    for i in range(n):
        if pi[i] > 0:
            model.add_transition(model.start, states[i], float(pi[i]))
    for i in range(n):
        for j in np.nonzero(A[i])[0]:
            model.add_transition(states[i], states[int(j)], float(A[i, j]))
    # no transition to model.end: a plain HMM without an end state
    model.bake(merge="None")

    names = [s.name for s in model.states[:n]]
    assert names == [cell_name(i) for i in range(n)], "state order after bake differs from cell order"
    assert model.silent_start == n
    assert all(s.is_silent() for s in model.states[n:])
    assert model.states[model.start_index] is model.start
    return model


def read_params(model, n, m):
    D = model.dense_transition_matrix()
    pi = D[model.start_index, :n].copy()
    A = D[:n, :n].copy()
    # no cell may lead to a silent state (start/end): a plain HMM
    assert np.all(D[:n, n:] == 0.0)
    B = np.zeros((n, m))
    for i in range(n):
        par = model.states[i].distribution.parameters[0]
        assert sorted(par.keys()) == list(range(m)), par.keys()
        for k in range(m):
            B[i, k] = par[k]
    return pi, A, B


# ---------------------------------------------------------------- numpy cross-check

def np_forward_backward(pi, A, B, seq):
    """Scaled forward-backward (Rabiner 1989, sec. V.A). Returns logP, gamma, xi-sum."""
    T, n = len(seq), len(pi)
    alpha = np.zeros((T, n))
    c = np.zeros(T)
    a = pi * B[:, seq[0]]
    c[0] = a.sum()
    alpha[0] = a / c[0]
    for t in range(1, T):
        a = (alpha[t - 1] @ A) * B[:, seq[t]]
        c[t] = a.sum()
        alpha[t] = a / c[t]
    beta = np.zeros((T, n))
    beta[T - 1] = 1.0
    for t in range(T - 2, -1, -1):
        beta[t] = (A @ (B[:, seq[t + 1]] * beta[t + 1])) / c[t + 1]
    gamma = alpha * beta
    xi = np.zeros((n, n))
    for t in range(T - 1):
        xi += np.outer(alpha[t], B[:, seq[t + 1]] * beta[t + 1]) * A / c[t + 1]
    return float(np.log(c).sum()), gamma, xi


def np_viterbi(pi, A, B, seq):
    """Log-space Viterbi (Rabiner 1989, sec. III.B)."""
    with np.errstate(divide="ignore"):
        lA, lB, lpi = np.log(A), np.log(B), np.log(pi)
    T, n = len(seq), len(pi)
    delta = lpi + lB[:, seq[0]]
    back = np.zeros((T, n), dtype=int)
    for t in range(1, T):
        cand = delta[:, None] + lA
        back[t] = np.argmax(cand, axis=0)
        delta = cand[back[t], np.arange(n)] + lB[:, seq[t]]
    path = [int(np.argmax(delta))]
    for t in range(T - 1, 0, -1):
        path.append(int(back[t, path[-1]]))
    return float(delta.max()), path[::-1]


def np_baum_welch_step(pi, A, B, runs):
    """One Baum-Welch step over several runs (Rabiner 1989, sec. V.B), no pseudocounts."""
    n, m = B.shape
    pi_num = np.zeros(n)
    xi_sum = np.zeros((n, n))
    emit = np.zeros((n, m))
    for seq in runs:
        _, gamma, xi = np_forward_backward(pi, A, B, seq)
        pi_num += gamma[0]
        xi_sum += xi
        for t, o in enumerate(seq):
            emit[:, o] += gamma[t]
    # every cell must be visited with positive weight, or the update is undefined
    assert np.all(xi_sum.sum(axis=1) > 0) and np.all(emit.sum(axis=1) > 0)
    return (pi_num / pi_num.sum(),
            xi_sum / xi_sum.sum(axis=1, keepdims=True),
            emit / emit.sum(axis=1, keepdims=True))


def rel_err(a, b):
    return abs(a - b) / max(abs(a), abs(b), 1e-300)


# ---------------------------------------------------------------- fixture

def edge_list(A):
    out = []
    for i in range(A.shape[0]):
        for j in range(A.shape[1]):
            if A[i, j] != 0.0:
                out.append({"from": i, "to": j, "p": float(A[i, j])})
    return out


def edge_values(A, edges):
    return [{"from": e["from"], "to": e["to"], "p": float(A[e["from"], e["to"]])} for e in edges]


def make_case(rng, index, worst):
    n, m, pi, A, B, runs = random_case(rng, index)
    model = build_pomegranate(n, m, pi, A, B)

    # parameters read back must be the ones set
    pi_r, A_r, B_r = read_params(model, n, m)
    assert np.all((pi_r > 0) == (pi > 0)), "start support changed"
    assert np.all((A_r > 0) == (A > 0)), "edge set changed"
    assert np.allclose(pi_r, pi, rtol=1e-14, atol=0), "start probabilities differ after bake"
    assert np.allclose(A_r, A, rtol=1e-14, atol=0), "transitions differ after bake"
    assert np.allclose(B_r, B, rtol=1e-14, atol=0), "emissions differ after bake"

    log_probs, posteriors, viterbis = [], [], []
    for seq in runs:
        lp = float(model.log_probability(seq))
        post = np.asarray(model.predict_proba(seq))
        vlp, vpath = model.viterbi(seq)
        assert vpath[0][1] is model.start, "viterbi path does not begin with the start state"
        path = [int(idx) for idx, _ in vpath[1:]]
        assert len(path) == len(seq) and all(0 <= p < n for p in path)
        assert all(vpath[k + 1][1].name == cell_name(path[k]) for k in range(len(path)))

        # independent numpy cross-check
        lp_np, gamma, _ = np_forward_backward(pi, A, B, seq)
        vlp_np, vpath_np = np_viterbi(pi, A, B, seq)
        assert post.shape == (len(seq), n)
        worst["logProb"] = max(worst["logProb"], rel_err(lp, lp_np))
        worst["posterior"] = max(worst["posterior"], float(np.abs(post - gamma).max()))
        worst["viterbiLogProb"] = max(worst["viterbiLogProb"], rel_err(float(vlp), vlp_np))
        assert rel_err(lp, lp_np) <= LOGP_RTOL, (index, lp, lp_np)
        assert np.abs(post - gamma).max() <= POST_ATOL, (index, np.abs(post - gamma).max())
        assert rel_err(float(vlp), vlp_np) <= VIT_RTOL, (index, vlp, vlp_np)
        assert path == vpath_np, (index, "viterbi paths differ")

        log_probs.append(lp)
        posteriors.append([[float(x) for x in row] for row in post])
        viterbis.append({"logProb": float(vlp), "path": path})

    # exactly one Baum-Welch step over all runs of the case
    total = float(model.summarize(runs, algorithm="baum-welch"))
    assert rel_err(total, sum(log_probs)) <= LOGP_RTOL
    model.from_summaries(inertia=0.0, pseudocount=0.0)
    pi1, A1, B1 = read_params(model, n, m)
    pi1_np, A1_np, B1_np = np_baum_welch_step(pi, A, B, runs)
    d_bw = max(float(np.abs(pi1 - pi1_np).max()), float(np.abs(A1 - A1_np).max()),
               float(np.abs(B1 - B1_np).max()))
    worst["baumWelch"] = max(worst["baumWelch"], d_bw)
    assert d_bw <= BW_ATOL, (index, d_bw)
    # the edge set and start support are kept by the step
    assert np.all((A1 > 0) <= (A > 0)) and np.all((pi1 > 0) <= (pi > 0))

    edges = edge_list(A)
    return {
        "name": "case-%d" % (index + 1),
        "nCells": n,
        "nReadings": m,
        "start": [float(x) for x in pi],
        "transitions": edges,
        "emission": [[float(x) for x in row] for row in B],
        "runs": runs,
        "logProb": log_probs,
        "totalLogProbBefore": float(sum(log_probs)),
        "posterior": posteriors,
        "viterbi": viterbis,
        "afterOneStep": {
            "start": [float(x) for x in pi1],
            "transitions": edge_values(A1, edges),
            "emission": [[float(x) for x in row] for row in B1],
        },
    }


# ---------------------------------------------------------------- writing

def dump(obj, indent=0):
    """JSON with one level per line, but lists of numbers on a single line."""
    pad, pad1 = " " * indent, " " * (indent + 1)
    if isinstance(obj, dict):
        if all(not isinstance(v, (dict, list)) for v in obj.values()):
            return json.dumps(obj, separators=(",", ":"), allow_nan=False)
        items = [pad1 + json.dumps(k) + ": " + dump(v, indent + 1) for k, v in obj.items()]
        return "{\n" + ",\n".join(items) + "\n" + pad + "}"
    if isinstance(obj, list):
        if all(not isinstance(v, (dict, list)) for v in obj):
            return json.dumps(obj, separators=(",", ":"), allow_nan=False)
        items = [pad1 + dump(v, indent + 1) for v in obj]
        return "[\n" + ",\n".join(items) + "\n" + pad + "]"
    return json.dumps(obj, allow_nan=False)  # floats via repr: round-trips exactly


def main():
    rng = np.random.RandomState(SEED)
    worst = {"logProb": 0.0, "posterior": 0.0, "viterbiLogProb": 0.0, "baumWelch": 0.0}
    cases = [make_case(rng, i, worst) for i in range(N_CASES)]

    notes = (
        "Each case is a plain discrete HMM built in pomegranate state by state: one "
        "State(DiscreteDistribution) per cell, keyed by the reading code 0..nReadings-1; only "
        "existing edges added (start->cell for cells with positive start probability, every "
        "dwell and link). No transition goes to model.end, so pomegranate treats the model as "
        "having no end state and log_probability is the plain HMM likelihood. bake(merge=\"None\") "
        "so the topology is not changed; cells are named c00000, c00001, ... because bake sorts "
        "states by name, and the script asserts the order after bake equals the cell order and "
        "that start, transitions and emissions read back equal the values set. Viterbi paths are "
        "given as cell indices with pomegranate's leading start state stripped. posterior is "
        "predict_proba (steps x cells). afterOneStep is exactly one Baum-Welch step over all runs "
        "of the case together: summarize(runs, algorithm=\"baum-welch\") then "
        "from_summaries(inertia=0.0, pseudocount=0.0), read back with dense_transition_matrix() "
        "and states[i].distribution.parameters[0]; the start probabilities are updated by this "
        "step (to the mean over runs of the first-step posterior), and cells with start "
        "probability 0 have no start edge and stay at 0. Runs were sampled from each model, "
        "with no dropouts. Cross-check passed: an independent numpy implementation (scaled "
        "forward-backward, log-space Viterbi, one Baum-Welch step; Rabiner 1989) agreed with "
        "pomegranate on every case: log P per run to %.1e relative (limit %.0e), posteriors to "
        "%.1e absolute (limit %.0e), Viterbi log P to %.1e relative with identical paths, one "
        "Baum-Welch step to %.1e absolute (limit %.0e)."
        % (worst["logProb"], LOGP_RTOL, worst["posterior"], POST_ATOL,
           worst["viterbiLogProb"], worst["baumWelch"], BW_ATOL))

    fixture = {
        "format": "underfoot-reference-hmm/1",
        "generator": "test/reference/make-pomegranate-fixtures.py",
        "library": "pomegranate",
        "pomegranateVersion": pomegranate.__version__,
        "numpyVersion": np.__version__,
        "pythonVersion": platform.python_version(),
        "seed": SEED,
        "rng": "numpy.random.RandomState",
        "crossCheck": {
            "logProbMaxRelErr": worst["logProb"],
            "posteriorMaxAbsErr": worst["posterior"],
            "viterbiLogProbMaxRelErr": worst["viterbiLogProb"],
            "baumWelchMaxAbsErr": worst["baumWelch"],
        },
        "notes": notes,
        "cases": cases,
    }
    text = dump(fixture) + "\n"
    # the written text must round-trip exactly
    assert json.loads(text) == fixture
    os.makedirs(os.path.dirname(OUT), exist_ok=True)
    tmp = OUT + ".tmp"
    with open(tmp, "w") as f:
        f.write(text)
    os.replace(tmp, OUT)
    print("wrote %s (%d bytes)" % (OUT, len(text.encode())))
    for c in cases:
        print("  %s: %d cells, %d readings, %d edges, %d runs, %d steps"
              % (c["name"], c["nCells"], c["nReadings"], len(c["transitions"]),
                 len(c["runs"]), sum(len(r) for r in c["runs"])))
    print("cross-check:", worst)


if __name__ == "__main__":
    main()
