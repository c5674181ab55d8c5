"""The script an engineer would write instead of Corelag's `predict --model lumped` (bench/cli.ts runs it
side by side): read the logger CSV, integrate C·dT/dt = (T_air(t) − T)/R with scipy's solve_ivp (RK45,
rtol 1e-6) through the linearly interpolated air, write the CSV. Usage: predict_scipy.py IN.csv OUT.csv TAU_S T0_C"""
import sys

import numpy as np
from scipy.integrate import solve_ivp

src, dst, tau, t0 = sys.argv[1], sys.argv[2], float(sys.argv[3]), float(sys.argv[4])
data = np.genfromtxt(src, delimiter=",", skip_header=1, dtype=None, encoding="utf-8", names=("time", "air"))
t = (data["time"].astype("datetime64[ms]") - data["time"].astype("datetime64[ms]")[0]).astype(np.float64) / 1000.0
air = data["air"].astype(np.float64)
sol = solve_ivp(lambda s, y: (np.interp(s, t, air) - y) / tau, (t[0], t[-1]), [t0], method="RK45", t_eval=t, rtol=1e-6, atol=1e-9)
np.savetxt(dst, np.column_stack([t, air, sol.y[0]]), delimiter=",", header="t_s,air_C,core_C", comments="", fmt="%.4f")
