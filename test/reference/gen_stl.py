"""Reference values for STL (Cleveland, Cleveland, McRae & Terpenning 1990) from statsmodels'
STL (Debian python3-statsmodels) on R's datasets co2 and nottem (read through Debian's Rscript),
with settings mapped to ours. Writes fixtures/stl_statsmodels.json.

Mapping (statsmodels -> our option): seasonal -> seasonalWindow, trend -> trendWindow,
low_pass -> lowPassWindow, seasonal_deg/trend_deg/low_pass_deg -> degrees,
seasonal_jump/trend_jump/low_pass_jump -> jumps, fit(inner_iter, outer_iter) -> innerLoops,
outerLoops. statsmodels' defaults differ from R's (and ours): seasonal_deg 1 and jumps 1;
inner_iter 5 (robust: 2) and outer_iter 0 (robust: 15). Every option is passed explicitly.
"""
import json
import os
import subprocess

import numpy as np
import statsmodels
from statsmodels.tsa.seasonal import STL


def r_dataset(name):
    out = subprocess.run(["Rscript", "--vanilla", "-e", f"cat(sprintf('%.17g', as.numeric({name})), sep=',')"],
                         check=True, capture_output=True, text=True).stdout
    return np.array([float(v) for v in out.split(",")])


def next_odd(x):
    r = int(round(x))
    return r + 1 if r % 2 == 0 else r


CASES = [
    # R's stl(co2, s.window = 7) settings
    dict(name="co2-s7-R-settings", data="co2", seasonal=7, seasonal_deg=0, trend=23, trend_deg=1, low_pass=13, low_pass_deg=1,
         seasonal_jump=1, trend_jump=3, low_pass_jump=2, robust=False, inner=2, outer=0),
    # statsmodels' own defaults (seasonal degree 1, jumps 1, 5 inner passes), made explicit
    dict(name="co2-s13-statsmodels-defaults", data="co2", seasonal=13, seasonal_deg=1, trend=None, trend_deg=1, low_pass=None, low_pass_deg=1,
         seasonal_jump=1, trend_jump=1, low_pass_jump=1, robust=False, inner=5, outer=0),
    dict(name="nottem-s7-robust-t21-jump1", data="nottem", seasonal=7, seasonal_deg=0, trend=21, trend_deg=1, low_pass=13, low_pass_deg=1,
         seasonal_jump=1, trend_jump=1, low_pass_jump=1, robust=True, inner=1, outer=15),
    dict(name="nottem-s9-deg1-robust-statsmodels-loops", data="nottem", seasonal=9, seasonal_deg=1, trend=None, trend_deg=1, low_pass=None, low_pass_deg=0,
         seasonal_jump=2, trend_jump=3, low_pass_jump=1, robust=True, inner=2, outer=15),
]

cases = []
for c in CASES:
    y = r_dataset(c["data"])
    period = 12
    trend = c["trend"] if c["trend"] is not None else next_odd(int(np.ceil(1.5 * period / (1 - 1.5 / c["seasonal"]))))
    low_pass = c["low_pass"] if c["low_pass"] is not None else next_odd(period)
    res = STL(y, period=period, seasonal=c["seasonal"], trend=trend, low_pass=low_pass,
              seasonal_deg=c["seasonal_deg"], trend_deg=c["trend_deg"], low_pass_deg=c["low_pass_deg"], robust=c["robust"],
              seasonal_jump=c["seasonal_jump"], trend_jump=c["trend_jump"], low_pass_jump=c["low_pass_jump"]).fit(
        inner_iter=c["inner"], outer_iter=c["outer"])
    cases.append({
        "name": c["name"], "dataset": f"R datasets::{c['data']}",
        "call": f"STL(y, period={period}, seasonal={c['seasonal']}, trend={trend}, low_pass={low_pass}, seasonal_deg={c['seasonal_deg']}, trend_deg={c['trend_deg']}, low_pass_deg={c['low_pass_deg']}, robust={c['robust']}, seasonal_jump={c['seasonal_jump']}, trend_jump={c['trend_jump']}, low_pass_jump={c['low_pass_jump']}).fit(inner_iter={c['inner']}, outer_iter={c['outer']})",
        "options": {"period": period, "seasonalWindow": c["seasonal"], "seasonalDegree": c["seasonal_deg"], "trendWindow": trend, "trendDegree": c["trend_deg"],
                    "lowPassWindow": low_pass, "lowPassDegree": c["low_pass_deg"], "seasonalJump": c["seasonal_jump"], "trendJump": c["trend_jump"],
                    "lowPassJump": c["low_pass_jump"], "innerLoops": c["inner"], "outerLoops": c["outer"]},
        "y": y.tolist(), "seasonal": res.seasonal.tolist(), "trend": res.trend.tolist(), "remainder": res.resid.tolist(),
    })

out = {"source": "statsmodels.tsa.seasonal.STL", "version": statsmodels.__version__,
       "data": "R datasets via " + subprocess.run(["Rscript", "--version"], capture_output=True, text=True).stderr.strip(),
       "note": __doc__.strip(), "cases": cases}
os.makedirs(os.path.join(os.path.dirname(__file__), "fixtures"), exist_ok=True)
with open(os.path.join(os.path.dirname(__file__), "fixtures", "stl_statsmodels.json"), "w") as f:
    json.dump(out, f)
