#!/usr/bin/env python3
"""Generate the invented rows of the mentoring three-wave demo (standard
library only). Every number is invented. Run: python3 generate.py > rows.csv

New hospital staff, three waves: at the start (wave 1) their sense of
belonging and their overtime; over the next five months (wave 2) the
mentoring hours they took up; at a year (wave 3) belonging again and their
intention to leave, on the same questionnaire. A few mentoring logs are
lost; more of the staff who felt they belonged least at the start skip
the questionnaire at a year (missing at random given wave 1).
"""
import random
import sys

SEED = int(sys.argv[1]) if len(sys.argv) > 1 else 18
rng = random.Random(SEED)
print("staff_id,belonging_w1,overtime_w1,mentoring_hours,belonging_w3,intent_leave_w3")
for i in range(1, 421):
    bel1 = rng.gauss(0, 1)
    over = -0.30 * bel1 + rng.gauss(0, 1)
    ment = 0.30 * bel1 - 0.25 * over + rng.gauss(0, 1)
    bel3 = 0.35 * ment + 0.40 * bel1 - 0.15 * over + rng.gauss(0, 0.8)
    intent = -0.35 * bel3 - 0.08 * ment - 0.10 * bel1 + 0.25 * over + rng.gauss(0, 0.85)
    row = [3.4 + 0.6 * bel1, max(0.0, 4.0 + 2.5 * over), max(0.0, 9.0 + 3.0 * ment), 3.4 + 0.65 * bel3,
           3.8 + 1.2 * intent]
    cells = [f"{row[0]:.2f}", f"{row[1]:.1f}", f"{row[2]:.1f}", f"{row[3]:.2f}", f"{row[4]:.2f}"]
    if rng.random() < 0.05:
        cells[2] = ""
    if rng.random() < (0.24 if bel1 < -0.5 else 0.07):
        cells[3], cells[4] = "", ""
    elif rng.random() < 0.03:
        cells[4] = ""
    print(f"N{i:03d}," + ",".join(cells))
