# Independent computation (NumPy/SciPy) of the check values used by PrecisionLevelEvaluationTest
# for carbon-in-steel-study.csv, an invented study (3 levels x 12 laboratories x 2 replicates,
# demo data: a wide cell planted at level 2 for L07 and a shifted mean at level 3 for L10).
# Run: python3 check_values.py   (NumPy 2.4, SciPy 1.17). "CALC": no published source.
import csv, numpy as np
rows = list(csv.DictReader(open(__file__.replace("check_values.py", "carbon-in-steel-study.csv"))))
labs = sorted({r["laboratory"] for r in rows})
def level(lv, drop=()):
    c = np.array([[float(r["value"]) for r in rows if r["level"] == str(lv) and r["laboratory"] == l]
                  for l in labs if l not in drop])
    p, n = c.shape
    me, sd = c.mean(1), c.std(1, ddof=1)
    h = (me - me.mean()) / me.std(ddof=1)
    k = sd * np.sqrt(p) / np.sqrt((sd ** 2).sum())
    C = (sd ** 2).max() / (sd ** 2).sum()
    gh, gl = (me.max() - me.mean()) / me.std(ddof=1), (me.mean() - me.min()) / me.std(ddof=1)
    x = np.sort(me); s0 = ((x - x.mean()) ** 2).sum()
    dh = ((x[:-2] - x[:-2].mean()) ** 2).sum() / s0; dl = ((x[2:] - x[2:].mean()) ** 2).sum() / s0
    sr2 = (sd ** 2).mean(); sd2 = n * me.var(ddof=1); sL2 = max(0.0, (sd2 - sr2) / n)
    sr, sR = np.sqrt(sr2), np.sqrt(sL2 + sr2)
    print(f"level {lv} drop {drop}: m={me.mean():.10g} C={C:.10g} Gh={gh:.10g} Gl={gl:.10g} "
          f"Dh={dh:.10g} Dl={dl:.10g} sr={sr:.10g} sL={np.sqrt(sL2):.10g} sR={sR:.10g} "
          f"r={2.8*sr:.10g} R={2.8*sR:.10g}")
    print("   h", " ".join(f"{v:.6f}" for v in h)); print("   k", " ".join(f"{v:.6f}" for v in k))
for lv in (1, 2, 3):
    level(lv)
level(3, drop=("L10",))
