"""Colour distances of the plot palette for tests/suite/report_figures.rs: every pair of series
colours, and each colour against the white canvas, as CIE76 ΔE*ab in L*a*b* (D65), for normal
vision and for protan, deutan and tritan vision simulated at severity 1.0 with the matrices of
Machado, Oliveira and Fernandes (IEEE TVCG 15, 2009; values from memory), applied in linear
sRGB (IEC 61966-2-1). Plain Python, no packages. Run once; the minima are pasted in the test.

    python3 tests/reference/palette_cvd.py
"""
import itertools

PALETTE = ["6B1148", "8FA8F0", "FC9915", "104DA1", "524617", "B29B5E"]
M = {
    "normal": [[1, 0, 0], [0, 1, 0], [0, 0, 1]],
    "protan": [[0.152286, 1.052583, -0.204868], [0.114503, 0.786281, 0.099216], [-0.003882, -0.048116, 1.051998]],
    "deutan": [[0.367322, 0.860646, -0.227968], [0.280085, 0.672501, 0.047413], [-0.011820, 0.042940, 0.968881]],
    "tritan": [[1.255528, -0.076749, -0.178779], [-0.078411, 0.930809, 0.147602], [0.004733, 0.691367, 0.303900]],
}


def linear(c):
    c /= 255
    return c / 12.92 if c <= 0.04045 else ((c + 0.055) / 1.055) ** 2.4


def lab(rgb):
    r, g, b = rgb
    x = 0.4124 * r + 0.3576 * g + 0.1805 * b
    y = 0.2126 * r + 0.7152 * g + 0.0722 * b
    z = 0.0193 * r + 0.1192 * g + 0.9505 * b
    f = lambda t: t ** (1 / 3) if t > (6 / 29) ** 3 else t / (3 * (6 / 29) ** 2) + 4 / 29
    fx, fy, fz = f(x / 0.95047), f(y), f(z / 1.08883)
    return (116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz))


def simulate(c, m):
    lin = [linear(v) for v in c]
    return lab([max(0, min(1, sum(m[i][j] * lin[j] for j in range(3)))) for i in range(3)])


def delta_e(a, b):
    return sum((x - y) ** 2 for x, y in zip(a, b)) ** 0.5


colours = [tuple(int(h[i : i + 2], 16) for i in (0, 2, 4)) for h in PALETTE]
for name, m in M.items():
    labs = [simulate(c, m) for c in colours]
    pair = min(delta_e(a, b) for a, b in itertools.combinations(labs, 2))
    white = min(delta_e(l, simulate((255, 255, 255), m)) for l in labs)
    print(f"{name}: closest pair ΔE {pair:.1f}, closest to white ΔE {white:.1f}")
# Output (2026-12-02):
# normal: closest pair ΔE 35.2, closest to white ΔE 49.7
# protan: closest pair ΔE 34.5, closest to white ΔE 47.6
# deutan: closest pair ΔE 34.5, closest to white ΔE 49.2
# tritan: closest pair ΔE 32.7, closest to white ΔE 37.8
