"""Straightforward pandas version of five absolute plateau-default rules, for tests/bench/rules.ts.

Reads every case-*.csv (columns t, etco2, rr, spo2; one row per 1 Hz sample) in the directory
given as argv[1], then times detection only (loading excluded) and prints one JSON object:
{"impl", "cases", "samples", "seconds", "episodes": {rule: [count, total_s]}}.

The way an analyst would write it: a boolean Series per rule, run ids from cumsum over the
places where a run cannot continue, groupby to get each run's start and end, filter by duration.
Same semantics as rules_numpy.py.
"""
import glob
import json
import os
import sys
import time

import pandas as pd

MAX_HOLD = 30.0


def load(directory):
    return [pd.read_csv(p) for p in sorted(glob.glob(os.path.join(directory, "case-*.csv")))]


def episodes(df, cond, min_s):
    t = df["t"]
    end = df["end"]
    continues = cond & cond.shift(1, fill_value=False) & (t == end.shift(1))
    run_id = (~continues).cumsum()
    true_rows = df[cond]
    grouped = true_rows.groupby(run_id[cond]).agg(start=("t", "min"), stop=("end", "max"))
    duration = grouped["stop"] - grouped["start"]
    kept = duration[duration >= min_s - 1e-9]
    return int(len(kept)), float(kept.sum())


def detect(df):
    df = df.copy()
    dt = df["t"].shift(-1) - df["t"]
    df["end"] = df["t"] + dt.fillna(dt.median()).clip(upper=MAX_HOLD)
    observed = df["spo2"] != 0
    apnea = (df["etco2"] < 5) | (df["rr"] == 0)
    return {
        "apnea": episodes(df, apnea, 20.0),
        "prolonged_apnea": episodes(df, apnea, 60.0),
        "bradypnea": episodes(df, (df["rr"] < 8) & (df["rr"] > 0), 30.0),
        "hypoxemia": episodes(df, (df["spo2"] < 90) & observed, 15.0),
        "severe_hypoxemia": episodes(df, (df["spo2"] < 85) & observed, 0.0),
    }


def main():
    cases = load(sys.argv[1])
    rounds = int(sys.argv[2]) if len(sys.argv) > 2 else 1
    best = float("inf")
    for r in range(rounds):
        t0 = time.perf_counter()
        results = [detect(df) for df in cases]
        best = min(best, time.perf_counter() - t0)
    totals = {}
    for res in results:
        for name, (count, total) in res.items():
            c = totals.setdefault(name, [0, 0.0])
            c[0] += count
            c[1] += total
    samples = sum(3 * len(df) for df in cases)
    print(json.dumps({"impl": "pandas", "cases": len(cases), "samples": samples, "seconds": best, "episodes": totals}))


if __name__ == "__main__":
    main()
