"""Vectorised numpy version of five absolute plateau-default rules, for tests/bench/rules.ts.

Reads every case-*.csv (columns t, etco2, rr, spo2; one row per 1 Hz sample) in the directory
given as argv[1], then times detection only (loading excluded) and prints one JSON object:
{"impl", "cases", "samples", "seconds", "episodes": {rule: [count, total_s]}}.

Semantics as rules.md for series sharing one time base: sample i covers
[t_i, t_i + min(t_{i+1} - t_i, 30)), the last sample min(median interval, 30); SpO2 of 0 is
unobserved; an episode is a run of true, touching samples lasting >= the minimum duration.
"""
import glob
import json
import os
import sys
import time

import numpy as np

MAX_HOLD = 30.0
RULES = [
    ("apnea", 20.0),
    ("prolonged_apnea", 60.0),
    ("bradypnea", 30.0),
    ("hypoxemia", 15.0),
    ("severe_hypoxemia", 0.0),
]


def load(directory):
    cases = []
    for path in sorted(glob.glob(os.path.join(directory, "case-*.csv"))):
        a = np.loadtxt(path, delimiter=",", skiprows=1)
        cases.append((a[:, 0].copy(), a[:, 1].copy(), a[:, 2].copy(), a[:, 3].copy()))
    return cases


def runs(cond, t, end, min_s):
    join = cond[:-1] & cond[1:] & (end[:-1] == t[1:])
    starts = np.flatnonzero(cond & ~np.concatenate(([False], join)))
    stops = np.flatnonzero(cond & ~np.concatenate((join, [False])))
    d = end[stops] - t[starts]
    keep = d >= min_s - 1e-9
    return int(keep.sum()), float(d[keep].sum())


def detect(t, etco2, rr, spo2):
    dt = np.diff(t)
    hold = np.minimum(np.append(dt, np.median(dt)), MAX_HOLD)
    end = t + hold
    observed = spo2 != 0
    apnea = (etco2 < 5) | (rr == 0)
    brady = (rr < 8) & (rr > 0)
    low = (spo2 < 90) & observed
    severe = (spo2 < 85) & observed
    return {
        "apnea": runs(apnea, t, end, 20.0),
        "prolonged_apnea": runs(apnea, t, end, 60.0),
        "bradypnea": runs(brady, t, end, 30.0),
        "hypoxemia": runs(low, t, end, 15.0),
        "severe_hypoxemia": runs(severe, t, end, 0.0),
    }


def main():
    cases = load(sys.argv[1])
    totals = {name: [0, 0.0] for name, _ in RULES}
    best = float("inf")
    rounds = int(sys.argv[2]) if len(sys.argv) > 2 else 3
    for r in range(rounds):
        t0 = time.perf_counter()
        results = [detect(*c) for c in cases]
        best = min(best, time.perf_counter() - t0)
    for res in results:
        for name, (count, total) in res.items():
            totals[name][0] += count
            totals[name][1] += total
    samples = sum(3 * len(c[0]) for c in cases)
    print(json.dumps({"impl": "numpy", "cases": len(cases), "samples": samples, "seconds": best, "episodes": totals}))


if __name__ == "__main__":
    main()
