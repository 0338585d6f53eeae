#!/usr/bin/env python3
"""
An independent reference for Fernwater's tank model (docs/engine.md, "State and processes").

Re-implements the state, the right-hand side and the events from the documentation and
integrates them with scipy's LSODA at tight tolerances, for the scenarios in
tools/reference-scenarios.json (stored fully expanded, so no schema defaults are needed here).
Writes tools/reference-output.json: every state component at days 7, 30 and 180, taken just
before any event due on that day. tests/models/reference.test.ts compares the engine with it;
CI needs no Python.

    python3 tools/reference_model.py            # regenerate tools/reference-output.json
    python3 tools/reference_model.py --time     # time one model year of the benchmark tank

Needs Python 3.9+, numpy and scipy (Debian: apt-get install python3-scipy).
Supported: continuous feeding, water changes, filter cleaning, trims every N days and when
full, drip, low-oxygen zones, pH following KH. Not supported (not used by the scenarios):
meals as pulses and fishless dosing.
"""
import json
import math
import os
import sys

import numpy as np
import scipy
from scipy.integrate import solve_ivp

HERE = os.path.dirname(os.path.abspath(__file__))
REPORT_DAYS = [7.0, 30.0, 180.0]
RTOL = 1e-10

# --- constants, as listed in docs/engine.md and docs/sources.md -------------------------------
N, O, H, C, CA = 14.007, 15.999, 1.008, 12.011, 40.078
CACO3, CAO = CA + C + 3 * O, CA + O
MG_CACO3_PER_DKH = 10 * CACO3 / CAO
EQ = (CACO3 / N / 2) / MG_CACO3_PER_DKH  # dKH per mg N/L per equivalent per N
FN = 0.1238  # g N per g VSS
AOB = dict(mu=0.9, K=0.5, Y=0.15, b=0.17, thb=1.029, Tmin=0, Topt=35, Tmax=45, Ko=0.5, Kfa=0.26)
NOB = dict(mu=1.0, K=0.25, Y=0.05, b=0.17, thb=1.029, Tmin=0, Topt=35, Tmax=42, Ko=0.9, Kfa=0.26)
AOB["Kfa"] = 32.0
K_FNA = 0.23
KH_HALF = 0.5
SEED, EST_FLOOR = 1e-5, 1e-3
GUT_RELEASE, TRAP, MINERAL, MINERAL_THETA = 4.0, 0.2, 0.05, 1.07
FEED = dict(nProtein=0.16, assimilated=0.8, excreted=0.8, tan=0.9)
PLANT_KA, PLANT_KN, PLANT_KI = 0.1, 0.3, 0.5
PLANT_T = dict(Tmin=5, Topt=28, Tmax=38, ref=25)
O2 = dict(perNH4=3.43, perNO2=1.14, fish=250.0, fishK=1.0, perOrgN=15.14, hetK=0.2, plantPerG=1067.0,
          plantPerNO3=4.57, surface=dict(still=1.5, gentle=4.0, rippling=10.0, strong=30.0), filterPass=0.02)
LOW = dict(denitK=0.5, annKa=0.07, annKn=0.05, cod=2.857, orgK=1.0, zoneShare=0.02, denitKi=0.2, annKi=0.02)
MEDIA = dict(rock=dict(low=0.18, typical=0.7, high=3.6), sand=dict(low=5.0, typical=20.0, high=80.0), oxic=1.0, full=3.0)
ANN_NO2, ANN_N2, ANN_NO3 = 1.32, 2.04, 0.26
ANN_BIO = 1 + ANN_NO2 - ANN_N2 - ANN_NO3
ANN_EQ = -1 + 1.32 - 0.26
SHARE_IN_FILTER, KILLED_TAP, LOST_TANK = 0.85, 0.6, 0.1
(TAN, NO2, NO3, ORGW, ORGF, AOBX, NOBX, KH, GUT, OX, N2D, N2A, DRIP) = range(13)
P0 = 13


def ctmi(t, tmin, topt, tmax):
    """Cardinal temperature model with inflection, Rosso et al. 1993."""
    if not (tmin < t < tmax):
        return 0.0
    num = (t - tmax) * (t - tmin) ** 2
    den = (topt - tmin) * ((topt - tmin) * (t - topt) - (topt - tmax) * (topt + tmin - 2 * t))
    return max(num / den, 0.0)


def o2_sat(t):
    """Benson & Krause 1984."""
    T = t + 273.15
    return math.exp(-139.34411 + 1.575701e5 / T - 6.642308e7 / T**2 + 1.2438e10 / T**3 - 8.621949e11 / T**4)


def fnh3(t, ph):
    """Emerson et al. 1975."""
    return 1 / (1 + 10 ** (0.09018 + 2729.92 / (t + 273.15) - ph))


def fna(t, ph):
    """Anthonisen et al. 1976."""
    return 1 / (1 + math.exp(-2300 / (t + 273.15)) * 10**ph)


def monod(x, k):
    return x / (k + abs(x))


def both(a, b):
    return a * b if a >= 0 and b >= 0 else min(a, b)


class Tank:
    def __init__(self, s):
        self.s = s
        w, f, fl, m, tap, lo = s["water"], s["fish"], s["filter"], s["maintenance"], s["tapWater"], s["lowOxygen"]
        mult = s["multipliers"]
        self.V, self.T = w["volumeL"], w["temperatureC"]
        self.ph0, self.kh0, self.follows = w["pH"], w["khDkh"], w["phFollowsKh"]
        cap = fl["capacityMgTanPerDay"] * mult["nitrifierCapacity"]

        def growth(p, t):
            return p["mu"] * ctmi(t, p["Tmin"], p["Topt"], p["Tmax"]) / ctmi(20, p["Tmin"], p["Topt"], p["Tmax"])

        def bmax(p, capacity):
            mu = growth(p, 25)
            b = p["b"] * p["thb"] ** 5
            q = mu / (p["Y"] * FN)
            fsub = 1 / (p["K"] + 1)
            return capacity / (q * fsub * max(1 - b / (mu * fsub), 0.05))

        self.bac = {}
        for name, p in (("aob", AOB), ("nob", NOB)):
            mx = bmax(p, cap)
            self.bac[name] = dict(q=growth(p, self.T) / (p["Y"] * FN), K=p["K"], Y=p["Y"] * FN,
                                  b=p["b"] * p["thb"] ** (self.T - 20), max=mx, floor=SEED * mx, Ko=p["Ko"], Kfa=p["Kfa"])
        self.o2sat = o2_sat(self.T)
        self.kla = O2["surface"][w["surfaceAgitation"]] + fl["turnoverPerHour"] * 24 * O2["filterPass"]
        self.feedN = f["feedGPerDay"] * f["proteinFraction"] * FEED["nProtein"] * 1000 * mult["feedLoad"]
        self.eaten = f["fractionEaten"]
        fish_growth = FEED["assimilated"] * (1 - FEED["excreted"])
        kept = 1 - fish_growth
        self.gutIn = self.feedN * self.eaten * kept
        self.uneaten = 0 if f["leftoversRemoved"] else self.feedN * (1 - self.eaten)
        self.gutToTan = FEED["assimilated"] * FEED["excreted"] / kept
        self.gutToFaeces = (1 - FEED["assimilated"]) / kept
        self.fishO2 = f["feedGPerDay"] * mult["feedLoad"] * self.eaten * O2["fish"]
        self.mineral = MINERAL * MINERAL_THETA ** (self.T - 20)
        self.drip = m["dripLPerDay"]
        blend = 1 - tap["roShare"]
        self.cTan, self.cNo3, self.cKh = tap["tan"] * blend, tap["nitrate"] * blend, tap["khDkh"] * blend
        pf = ctmi(self.T, PLANT_T["Tmin"], PLANT_T["Topt"], PLANT_T["Tmax"]) / ctmi(PLANT_T["ref"], PLANT_T["Tmin"], PLANT_T["Topt"], PLANT_T["Tmax"])
        self.plants = [dict(r=g["growthRatePerDay"] * mult["plantUptake"] * pf, max=g["maxMassG"], n=g["nitrogenContent"] * 1000)
                       for g in s["plants"]]
        self.denit = 0.0
        if lo["enabled"]:
            if lo["zoneSize"] == "fromCapacity":
                self.denit = lo["denitrificationCapacityMgNPerDay"]
            else:
                depth = min(max((lo["sandBedDepthCm"] - MEDIA["oxic"]) / (MEDIA["full"] - MEDIA["oxic"]), 0), 1)
                est = lo["capacityEstimate"]
                self.denit = lo["porousRockL"] * MEDIA["rock"][est] + lo["sandBedAreaM2"] * depth * MEDIA["sand"][est]
        self.anammox = lo["anammoxCapacityMgNPerDay"] if lo["enabled"] and lo["anammoxEnabled"] else 0.0

    def ph(self, kh):
        if not self.follows:
            return self.ph0
        return min(10, max(4, self.ph0 + math.log10(max(kh, 1e-3) / max(self.kh0, 1e-3))))

    def rhs(self, _t, y):
        V = self.V
        S, N2, N3, oW, oF = y[TAN], y[NO2], y[NO3], y[ORGW], y[ORGF]
        BA, BN, KHv = max(y[AOBX], 0), max(y[NOBX], 0), max(y[KH], 0)
        G, Ox = y[GUT], y[OX]
        ph = self.ph(KHv)
        FA = max(S, 0) * fnh3(self.T, ph)
        FNA = max(N2, 0) * fna(self.T, ph)
        fkh = KHv**2 / (KHv**2 + KH_HALF**2)
        inh_fna = K_FNA / (K_FNA + FNA)
        a, n = self.bac["aob"], self.bac["nob"]
        R1 = a["q"] * fkh * a["Kfa"] / (a["Kfa"] + FA) * inh_fna * both(monod(S, a["K"]), monod(Ox, a["Ko"])) * BA
        gA = a["Y"] * R1
        lossA = a["b"] * max(BA - a["floor"], 0) + (gA * BA / a["max"] if gA > 0 else 0)
        R2 = n["q"] * fkh * n["Kfa"] / (n["Kfa"] + FA) * inh_fna * both(monod(N2, n["K"]), monod(Ox, n["Ko"])) * BN
        gN = n["Y"] * R2
        lossN = n["b"] * max(BN - n["floor"], 0) + (gN * BN / n["max"] if gN > 0 else 0)
        trap, minW, minF, rel = TRAP * oW, self.mineral * oW, self.mineral * oF, GUT_RELEASE * G
        fA = monod(S, PLANT_KA)
        fNit = (1 - fA) * monod(N3, PLANT_KN) * PLANT_KI / (PLANT_KI + max(S, 0))
        dy = np.zeros(len(y))
        upA = upN = grown = 0.0
        for i, p in enumerate(self.plants):
            P = max(y[P0 + i], 0)
            room = 1 - P / p["max"]
            pot = p["r"] * P * room if room > 0 else 0
            upA += p["n"] * pot * fA
            upN += p["n"] * pot * fNit
            dy[P0 + i] = pot * (fA + fNit)
            grown += dy[P0 + i]
        zone_o = max(Ox, 0) * LOW["zoneShare"]
        D = denMin = denMinW = 0.0
        if self.denit > 0:
            D = self.denit * both(monod(N3, LOW["denitK"]), monod(oW + oF, LOW["orgK"] * V)) * LOW["denitKi"] / (LOW["denitKi"] + zone_o)
            denMin = LOW["cod"] / O2["perOrgN"] * D
            aw, af = abs(oW), abs(oF)
            denMinW = denMin * aw / (aw + af) if aw + af > 0 else denMin / 2
        A = 0.0
        if self.anammox > 0:
            nh4 = S * (1 - fnh3(self.T, ph))
            A = self.anammox * both(monod(nh4, LOW["annKa"]), monod(N2, LOW["annKn"])) * LOW["annKi"] / (LOW["annKi"] + zone_o)
        q = self.drip
        fromOrg = rel * self.gutToTan + minW + minF + denMin
        dy[TAN] = (fromOrg - R1 - gA - upA - A + q * (self.cTan - S)) / V
        dy[NO2] = (R1 - R2 - gN - ANN_NO2 * A - q * N2) / V
        dy[NO3] = (R2 - upN - D + ANN_NO3 * A + q * (self.cNo3 - N3)) / V
        dy[ORGW] = self.uneaten + rel * self.gutToFaeces - trap - minW - denMinW
        dy[ORGF] = trap - minF + lossA + lossN + ANN_BIO * A - (denMin - denMinW)
        dy[AOBX] = gA - lossA
        dy[NOBX] = gN - lossN
        eq = fromOrg - 2 * R1 - gA + gN - upA + upN + D + ANN_EQ * A
        dy[KH] = (EQ * eq + q * (self.cKh - KHv)) / V
        dy[GUT] = self.gutIn - rel
        used = O2["perNH4"] * R1 + O2["perNO2"] * R2 + self.fishO2 * monod(Ox, O2["fishK"]) + O2["perOrgN"] * (minW + minF) * monod(Ox, O2["hetK"])
        made = O2["plantPerG"] * grown + O2["plantPerNO3"] * upN
        dy[OX] = (self.kla + q / V) * (self.o2sat - Ox) + (made - used) / V
        dy[N2D] = D
        dy[N2A] = ANN_N2 * A
        dy[DRIP] = q * (S + N2 + N3)
        return dy

    def initial(self):
        s = self.s
        y = np.zeros(P0 + len(self.plants))
        y[TAN], y[NO2], y[NO3], y[KH], y[OX] = s["water"]["startTan"], s["water"]["startNitrite"], s["water"]["startNitrate"], s["water"]["khDkh"], self.o2sat
        kept_in = self.gutIn
        y[GUT] = kept_in / GUT_RELEASE
        to_det = kept_in * self.gutToFaeces + self.uneaten
        if s["filter"]["establishedAtStart"]:
            y[ORGW] = to_det / (TRAP + self.mineral)
            y[ORGF] = y[ORGW] * TRAP / self.mineral
            load = kept_in + self.uneaten
            for idx, name in ((AOBX, "aob"), (NOBX, "nob")):
                b = self.bac[name]
                g = b["Y"] * load
                y[idx] = max((g + b["b"] * b["floor"]) * b["max"] / (b["b"] * b["max"] + g), EST_FLOOR * b["max"])
        else:
            y[AOBX], y[NOBX] = SEED * self.bac["aob"]["max"], SEED * self.bac["nob"]["max"]
        for i, g in enumerate(s["plants"]):
            y[P0 + i] = g["startMassG"]
        return y


def periodic(interval, end, first=None):
    first = interval if first is None else first
    out, k = [], 0
    while interval > 0:
        t = first + k * interval
        if t >= end - 1e-9:
            break
        out.append(t)
        k += 1
    return out


def schedule(tank):
    s, ev = tank.s, []
    m, fl = s["maintenance"], s["filter"]
    if m["waterChangeIntervalDays"] > 0 and m["waterChangeFraction"] > 0:
        for t in periodic(m["waterChangeIntervalDays"], s["run"]["lengthDays"]):
            ev.append((t, 40, "change", None))
    if fl["cleaningIntervalDays"] > 0:
        for t in periodic(fl["cleaningIntervalDays"], s["run"]["lengthDays"]):
            ev.append((t, 30, "clean", None))
    for i, g in enumerate(s["plants"]):
        if g["trim"]["rule"] == "everyDays":
            for t in periodic(g["trim"]["everyDays"], s["run"]["lengthDays"]):
                ev.append((t, 50 + i, "trim", i))
    return sorted(ev, key=lambda e: (e[0], e[1]))


def apply(tank, kind, arg, y):
    s = tank.s
    y = y.copy()
    if kind == "change":
        f, g = s["maintenance"]["waterChangeFraction"], s["maintenance"]["gravelCleaningFraction"]
        y[TAN] += f * (tank.cTan - y[TAN])
        y[NO2] -= f * y[NO2]
        y[NO3] += f * (tank.cNo3 - y[NO3])
        y[KH] += f * (tank.cKh - y[KH])
        y[OX] += f * (tank.o2sat - y[OX])
        y[ORGW] -= g * y[ORGW]
    elif kind == "clean":
        fl = s["filter"]
        share = SHARE_IN_FILTER * (KILLED_TAP if fl["cleanedInTapWater"] else LOST_TANK)
        y[ORGF] -= fl["organicsRemovedFraction"] * y[ORGF]
        y[AOBX] -= share * y[AOBX]
        y[NOBX] -= share * y[NOBX]
    elif kind == "trim":
        g = s["plants"][arg]
        target = g["trim"]["trimToFraction"] * g["maxMassG"]
        if y[P0 + arg] > target:
            y[P0 + arg] = target
    return y


def run(s, rtol=None):
    global RTOL
    if rtol is not None:
        RTOL = rtol
    tank = Tank(s)
    y, t = tank.initial(), 0.0
    end = s["run"]["lengthDays"]
    atol = np.array([1e-12] * 3 + [1e-9] * 2 + [1e-14] * 2 + [1e-11, 1e-10, 1e-10, 1e3, 1e3, 1e3] + [1e-11] * len(s["plants"]))
    watches = [(i, g["trim"]["fullAtFraction"] * g["maxMassG"]) for i, g in enumerate(s["plants"]) if g["trim"]["rule"] == "whenFull"]
    stops = sorted(set([e[0] for e in schedule(tank)] + REPORT_DAYS + [end]))
    events = schedule(tank)
    report = {}
    for stop in stops:
        while t < stop - 1e-12:
            evs = []
            for i, thr in watches:
                fn = (lambda i, thr: (lambda _t, yy: yy[P0 + i] - thr))(i, thr)
                fn.terminal, fn.direction = True, 1
                evs.append(fn)
            sol = solve_ivp(tank.rhs, (t, stop), y, method="LSODA", rtol=RTOL, atol=atol, events=evs or None)
            if not sol.success:
                raise RuntimeError(sol.message)
            y, t = sol.y[:, -1].copy(), sol.t[-1]
            hit = [k for k, te in enumerate(sol.t_events or []) if len(te) > 0] if evs else []
            if hit and t < stop - 1e-12:
                i = watches[hit[0]][0]
                g = s["plants"][i]
                y[P0 + i] = g["trim"]["trimToFraction"] * g["maxMassG"]
        t = stop
        if any(abs(stop - d) < 1e-9 for d in REPORT_DAYS):
            report[f"{stop:g}"] = y.tolist()
        for (te, _o, kind, arg) in events:
            if abs(te - stop) < 1e-9:
                y = apply(tank, kind, arg, y)
        for i, thr in watches:  # trims whose threshold an event left exceeded
            if y[P0 + i] >= thr:
                g = s["plants"][i]
                y[P0 + i] = g["trim"]["trimToFraction"] * g["maxMassG"]
    return report


def time_model_year():
    """Median wall time of one model year of the benchmark tank (bench/engine.ts), LSODA."""
    import copy
    import time

    with open(os.path.join(HERE, "reference-scenarios.json")) as fh:
        s = copy.deepcopy(json.load(fh)["planted-community"])
    s["run"]["lengthDays"] = 365
    for rtol in (1e-6, 1e-10):
        times = []
        for _ in range(5):
            t0 = time.perf_counter()
            run(s, rtol)
            times.append((time.perf_counter() - t0) * 1000)
        print(f"scipy LSODA, one model year, rtol {rtol:g}: median {sorted(times)[2]:.0f} ms")


def main():
    if "--time" in sys.argv:
        time_model_year()
        return
    with open(os.path.join(HERE, "reference-scenarios.json")) as fh:
        scenarios = json.load(fh)
    out = {
        "about": "State at days 7, 30 and 180 (before that day's events) from tools/reference_model.py, "
        f"scipy {scipy.__version__} LSODA, rtol {RTOL}. Order of components: docs/engine.md.",
        "scenarios": {},
    }
    for name, s in scenarios.items():
        out["scenarios"][name] = run(s)
        print(name, "done", file=sys.stderr)
    with open(os.path.join(HERE, "reference-output.json"), "w") as fh:
        json.dump(out, fh, indent=1)
        fh.write("\n")


if __name__ == "__main__":
    main()
