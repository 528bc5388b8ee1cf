#!/usr/bin/env python3
"""Generate the invented rows of the sleep-and-attention demo (standard
library only). Every number is invented. Run: python3 generate.py > rows.csv

Sleep hours go unreported far more often by students with a part-time job
(missing at random given the job), and the "paper" fills them in with the
mean.
"""
import random
import sys

SEED = int(sys.argv[1]) if len(sys.argv) > 1 else 1
rng = random.Random(SEED)
print("student,part_time_job,sleep_hours,attention")
for i in range(1, 301):
    job = 1 if rng.random() < 0.4 else 0
    sleep = 7.6 - 0.9 * job + rng.gauss(0, 1.0)
    attention = 48 + 2.0 * sleep - 2.0 * job + rng.gauss(0, 7.0)
    hidden = rng.random() < (0.75 if job else 0.35)
    sleep_cell = "" if hidden else f"{sleep:.1f}"
    print(f"S{i:03d},{job},{sleep_cell},{attention:.1f}")
