"""Reference for bench/analyze.bench.ts (benchmark only, never a test dependency).

The same figures as `probebook analyze --json` on a `Time (s),CH1 (V)` CSV,
done the usual numpy way: np.loadtxt, then vectorised levels, mean-level
crossings and numpy.fft.rfft of the whole record with a Hann window.
Prints the figures as JSON.
"""
import json
import sys

import numpy as np


def main(path: str) -> None:
    data = np.loadtxt(path, delimiter=",", skiprows=1)
    t, v = data[:, 0], data[:, 1]
    n = v.size
    dt = (t[-1] - t[0]) / (n - 1)
    fs = 1.0 / dt
    mean0 = v.mean()
    # Rising mean-level crossings, interpolated.
    below = v[:-1] < mean0
    idx = np.nonzero(below & (v[1:] >= mean0))[0]
    frac = (mean0 - v[idx]) / (v[idx + 1] - v[idx])
    times = idx + frac
    k = np.arange(times.size)
    period = np.polyfit(k, times, 1)[0]
    # Whole periods from the first crossing.
    start = int(np.ceil(times[0]))
    periods = int((n - 1 - times[0]) // period)
    seg = v[start:int(round(times[0] + periods * period))]
    mean = seg.mean()
    rms = np.sqrt(np.mean(seg**2))
    rms_ac = seg.std()
    # Spectrum of the whole record, Hann window, refined peak.
    w = np.hanning(n)
    spec = np.abs(np.fft.rfft((v - mean0) * w))
    b = int(round(n / period))
    b = b - 2 + int(np.argmax(spec[b - 2 : b + 3]))
    a, c, d = np.log(spec[b - 1 : b + 2])
    offset = 0.5 * (a - d) / (a - 2 * c + d)
    f0 = (b + offset) * fs / n
    # Harmonics: energy in the bins around k·f0 (Hann main lobe), k = 1…50 below fs/2.
    top = min(50, int(np.ceil(fs / f0 / 2)) - 1)
    power = []
    for h in range(1, top + 1):
        centre = int(round(h * f0 * n / fs))
        power.append(np.sum(spec[max(0, centre - 3) : centre + 4] ** 2))
    thd = float(np.sqrt(np.sum(power[1:]) / power[0]))
    duty = float(np.mean(seg > mean))
    print(json.dumps({
        "samples": int(n), "sampleRate": fs, "frequency": f0, "vpp": float(v.max() - v.min()),
        "vrms": float(rms), "vrmsAc": float(rms_ac), "mean": float(mean), "duty": duty, "thd": thd,
    }))


if __name__ == "__main__":
    main(sys.argv[1])
