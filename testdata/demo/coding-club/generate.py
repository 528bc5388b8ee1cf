#!/usr/bin/env python3
"""Generate the invented rows of the coding-club demo (standard library only).

The scenario and every number are invented for the demo. Run from this
folder: python3 generate.py > rows.csv
"""
import random

rng = random.Random(20261201)
print("participant_id,parent_degree,club_member,practice_hours,persistence")
for i in range(1, 401):
    parent_degree = 1 if rng.random() < 0.45 else 0
    club_member = 1 if rng.random() < (0.55 if parent_degree else 0.30) else 0
    practice = max(0.0, 1.5 + 2.2 * club_member + rng.gauss(0, 1.6))
    persistence = 2.0 + 0.35 * practice + 0.5 * parent_degree + rng.gauss(0, 1.0)
    # Practice hours go unreported more often without a parent with a degree (MAR).
    p_missing = 0.05 if parent_degree else 0.20
    practice_cell = "" if rng.random() < p_missing else f"{practice:.1f}"
    if practice_cell and rng.random() < 0.03:
        practice_cell = "-99"  # the questionnaire's code for "refused"
    persistence_cell = "NA" if rng.random() < 0.04 else f"{persistence:.2f}"
    print(f"P{i:03d},{parent_degree},{club_member},{practice_cell},{persistence_cell}")
