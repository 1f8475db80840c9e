"""Throughput of `beamsift select` against catalogue size and thread count.

Usage: python3 benches/scaling.py   (from the repository; standard library
only). Generates welded-I catalogues of about 10^4 to 10^7 rows with
`beamsift catalog generate` into the temp folder (once), runs select on
benches/peer/job.toml with --jobs 1 and --jobs 2, best of three, and writes
benches/scaling.svg (rows per second against rows, one line per thread
count, logarithmic rows axis) and prints the table it plotted.
"""

import math
import os
import subprocess
import sys
import tempfile
import time

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
BIN = os.path.join(ROOT, "target", "release", "beamsift")
DIR = os.path.join(tempfile.gettempdir(), "beamsift-scaling")
TF = ["--tf", "6,8,10,12,15,18,20,22,25,28,30,35,40mm", "--tw", "5,6,8,10,12,14mm",
      "--lambda-f", "9.15", "--lambda-w", "90.5", "--price-per-kg", "1.25"]
# (bf step, hw step) in mm: about 10^4, 10^5, 10^6 and 10^7 rows.
SIZES = [("20mm", "50mm"), ("5mm", "12.5mm"), ("2mm", "5mm"), ("1mm", "1mm")]


def catalogue(bf_step, hw_step):
    path = os.path.join(DIR, f"welded-{bf_step}-{hw_step}.csv")
    if not os.path.exists(path):
        subprocess.run([BIN, "catalog", "generate", "welded-i", "--bf", f"100..600:{bf_step}",
                        "--hw", f"200..1400:{hw_step}", *TF, "-o", path], check=True,
                       stderr=subprocess.DEVNULL)
    with open(path, "rb") as f:
        rows = sum(1 for line in f if not line.startswith(b"#")) - 1
    return path, rows


def best_of(n, args):
    # Standard output opened write-only: beamsift takes a read-write
    # /dev/null (subprocess.DEVNULL) for a closed standard output.
    times = []
    with open(os.devnull, "w") as null:
        for _ in range(n):
            t = time.perf_counter()
            subprocess.run(args, stdout=null, stderr=subprocess.DEVNULL, check=True)
            times.append(time.perf_counter() - t)
    return min(times)


def svg(points):
    w, h, left, bottom, top, right = 640, 380, 80, 50, 30, 150
    xs = [math.log10(r) for r, _, _ in points]
    ymax = max(max(a, b) for _, a, b in points) * 1.1
    x0, x1 = math.floor(min(xs)), max(xs) + 0.15
    px = lambda v: left + (v - x0) / (x1 - x0) * (w - left - right)
    py = lambda v: h - bottom - v / ymax * (h - bottom - top)
    out = [f'<svg xmlns="http://www.w3.org/2000/svg" width="{w}" height="{h}" font-family="sans-serif" font-size="12">',
           f'<rect width="{w}" height="{h}" fill="white"/>',
           f'<line x1="{left}" y1="{h-bottom}" x2="{w-right}" y2="{h-bottom}" stroke="black"/>',
           f'<line x1="{left}" y1="{top}" x2="{left}" y2="{h-bottom}" stroke="black"/>']
    for e in range(x0, math.floor(x1) + 1):
        out.append(f'<text x="{px(e)}" y="{h-bottom+18}" text-anchor="middle">10^{e}</text>')
    raw = ymax / 5
    mag = 10 ** math.floor(math.log10(raw))
    step = next(m * mag for m in (1, 2, 5, 10) if m * mag >= raw)
    k = 0
    while k * step <= ymax:
        y = py(k * step)
        out.append(f'<line x1="{left-4}" y1="{y}" x2="{left}" y2="{y}" stroke="black"/>')
        out.append(f'<text x="{left-8}" y="{y+4}" text-anchor="end">{k*step/1e6:g} M</text>')
        k += 1
    out.append(f'<text x="{(left+w-right)/2}" y="{h-12}" text-anchor="middle">catalogue rows</text>')
    out.append(f'<text x="16" y="{(top+h-bottom)/2}" transform="rotate(-90 16 {(top+h-bottom)/2})" text-anchor="middle">rows checked per second</text>')
    for idx, (colour, label) in enumerate([("#1f5fa8", "--jobs 1"), ("#c0392b", "--jobs 2")]):
        pts = " ".join(f"{px(math.log10(r))},{py(p[idx])}" for r, *p in points)
        out.append(f'<polyline points="{pts}" fill="none" stroke="{colour}" stroke-width="2"/>')
        for r, *p in points:
            out.append(f'<circle cx="{px(math.log10(r))}" cy="{py(p[idx])}" r="3" fill="{colour}"/>')
        out.append(f'<text x="{w-right+10}" y="{top+20+18*idx}" fill="{colour}">{label}</text>')
    out.append(f'<text x="{w-right+10}" y="{top+66}" font-size="10">workers; one more</text>')
    out.append(f'<text x="{w-right+10}" y="{top+80}" font-size="10">thread reads</text>')
    out.append("</svg>")
    return "\n".join(out)


def main():
    os.makedirs(DIR, exist_ok=True)
    job = os.path.join(ROOT, "benches", "peer", "job.toml")
    points = []
    print("rows, rows/s with --jobs 1, rows/s with --jobs 2")
    for bf, hw in SIZES:
        path, rows = catalogue(bf, hw)
        n = 1 if rows > 5_000_000 else 3
        rate = [rows / best_of(n, [BIN, "select", "--job", job, "-c", path, "-q", "--jobs", str(j)])
                for j in (1, 2)]
        points.append((rows, rate[0], rate[1]))
        print(f"{rows}, {rate[0]:.0f}, {rate[1]:.0f}")
    with open(os.path.join(ROOT, "benches", "scaling.svg"), "w") as f:
        f.write(svg(points))


if __name__ == "__main__":
    sys.exit(main())
