#!/usr/bin/python3
"""Synthetic marked photos for package marks' tests, projected by OpenCV.

Run from this directory with Debian's Python and python3-opencv:
    /usr/bin/python3 gen_scenes.py > scenes_opencv.csv

Each row is one scene: a pinhole camera (focal length from a 35 mm
equivalent, principal point at the image centre, no distortion) at a known
height, pitch, roll and heading above level ground, the sun at a known
altitude and azimuth, three vertical objects with their shadows, a vertical
edge, the sea horizon (depressed by the dip of the Nautical Almanac's
formula, 1.76' * sqrt(height in metres)), a ground line of known bearing and,
in "sun_in_frame" scenes, the sun's disc centre. Every pixel position comes
from cv2.projectPoints; nothing here solves the inverse problem.

World frame: x east, y north, z up, metres; the camera is at (0, 0, cam_h).
Camera frame (OpenCV): x right, y down, z along the optical axis. Pixel
coordinates: origin at the top-left corner of the image, x right, y down;
the centre of the top-left pixel is (0.5, 0.5), so the principal point is
(width/2, height/2). Angles in degrees; azimuths and bearings clockwise from
north. A mark that falls outside the image is left empty.

The random scene parameters (numpy, fixed seed) are inputs only; the pixel
positions are the reference.
"""
import math
import sys

import cv2
import numpy as np

rng = np.random.default_rng(20261202)
rng2 = np.random.default_rng(20261203)  # slope and lean directions only
DIAG35 = math.hypot(36.0, 24.0)  # diagonal of the 36 x 24 mm frame

# (width, height, f35 mm): phones (ultra-wide to tele) and cameras.
BODIES = [
    (4032, 3024, 13), (4032, 3024, 24), (4032, 3024, 26), (3024, 4032, 26),
    (4032, 3024, 52), (4032, 3024, 77), (6000, 4000, 24), (6000, 4000, 35),
    (6000, 4000, 50), (4000, 6000, 50), (6000, 4000, 85), (5184, 3456, 70),
]


def camera(heading, pitch, roll, cam_h):
    """World-to-camera rotation and translation for OpenCV."""
    H, p, r = map(math.radians, (heading, pitch, roll))
    fwd = np.array([math.sin(H) * math.cos(p), math.cos(H) * math.cos(p), math.sin(p)])
    right0 = np.array([math.cos(H), -math.sin(H), 0.0])
    down0 = np.cross(fwd, right0)
    x = math.cos(r) * right0 + math.sin(r) * down0
    y = -math.sin(r) * right0 + math.cos(r) * down0
    R = np.vstack([x, y, fwd])
    C = np.array([0.0, 0.0, cam_h])
    return R, -R @ C, C


def project(pts, R, t, K):
    pts = np.asarray(pts, dtype=np.float64).reshape(-1, 3)
    rvec, _ = cv2.Rodrigues(R)
    img, _ = cv2.projectPoints(pts, rvec, t, K, None)
    cam = (R @ pts.T).T + t
    return img.reshape(-1, 2), cam[:, 2]


def inside(img, depth, w, h, margin=20):
    return bool(np.all(depth > 0) and np.all(img[:, 0] > margin) and np.all(img[:, 0] < w - margin)
                and np.all(img[:, 1] > margin) and np.all(img[:, 1] < h - margin))


def horiz(az):
    a = math.radians(az)
    return np.array([math.sin(a), math.cos(a), 0.0])


def scene(kind):
    while True:
        w, h, f35 = BODIES[rng.integers(len(BODIES))]
        f = f35 * math.hypot(w, h) / DIAG35
        K = np.array([[f, 0, w / 2], [0, f, h / 2], [0, 0, 1]], dtype=np.float64)
        hfov = math.degrees(math.atan(w / 2 / f))
        vfov = math.degrees(math.atan(h / 2 / f))
        heading = rng.uniform(0, 360)
        pitch = rng.uniform(-30, 10)
        if kind == "sun_in_frame":
            pitch = rng.uniform(0, 10)
        roll = rng.uniform(-10, 10)
        cam_h = rng.choice([rng.uniform(1.2, 2.0), rng.uniform(5, 30)])
        R, t, C = camera(heading, pitch, roll, cam_h)
        if kind == "sun_in_frame":
            lo, hi = max(8, pitch - 0.6 * vfov), min(65, pitch + 0.6 * vfov)
            if lo >= hi:
                continue
            alt = rng.uniform(lo, hi)
            az = heading + rng.uniform(-0.6, 0.6) * hfov
            if alt < 8:
                continue
        else:
            alt = rng.uniform(8, 65)
            az = rng.uniform(0, 360)
        sun = np.array([math.cos(math.radians(alt)) * math.sin(math.radians(az)),
                        math.cos(math.radians(alt)) * math.cos(math.radians(az)),
                        math.sin(math.radians(alt))])
        row = dict(kind=kind, width=w, height=h, f35=f35, f_px=f, pitch=pitch, roll=roll,
                   heading=heading % 360, cam_h=cam_h, sun_alt=alt, sun_az=az % 360)

        objs, objs3d, bearings = [], [], []
        tries = 0
        while len(objs) < 3 and tries < 3000:
            tries += 1
            if kind == "same_bearing" and len(objs) == 1:
                b = bearings[0] + rng.choice([-1, 1]) * rng.uniform(0.2, 1.0)
            else:
                b = heading + rng.uniform(-0.9, 0.9) * hfov
            dist = rng.uniform(2, 25)
            B = C * [1, 1, 0] + dist * horiz(b)
            ho = rng.uniform(0.5, 5.0)
            T = B + [0, 0, ho]
            S = B - ho / math.tan(math.radians(alt)) * sun * [1, 1, 0] / math.cos(math.radians(alt))
            img, depth = project([B, T, S], R, t, K)
            if inside(img, depth, w, h):
                objs.append(img)
                objs3d.append((B, S, ho))
                bearings.append(b)
        if len(objs) < 3:
            continue
        for i, img in enumerate(objs):
            for name, p in zip("bts", img):
                row[f"o{i+1}_{name}x"], row[f"o{i+1}_{name}y"] = p
        # A pasted third object: its shadow turned about its base on the
        # ground by 10, 20 and 40 degrees (one random sense per scene).
        B3, S3, ho3 = objs3d[2]
        sense = rng.choice([-1.0, 1.0])
        for rot in (10, 20, 40):
            a = math.radians(sense * rot)
            d = S3 - B3
            d = np.array([d[0] * math.cos(a) + d[1] * math.sin(a), -d[0] * math.sin(a) + d[1] * math.cos(a), 0.0])
            img, depth = project([B3 + d], R, t, K)
            if depth[0] > 0:
                row[f"o3_rot{rot}_sx"], row[f"o3_rot{rot}_sy"] = img[0]
        # The third object again, its shadow falling on ground that slopes
        # 2 degrees, and leaning 2 degrees on level ground: the other causes
        # the lighting check names. Their directions come from a second
        # generator, so that every other value is as before.
        T3 = B3 + [0, 0, ho3]
        tilt = math.tan(math.radians(2))
        fall = horiz(rng2.uniform(0, 360))
        # Ground through B3 falling toward `fall`: z = -tilt * ((X - B3) . fall);
        # the ray T3 - t*sun meets it where ho3 - t*sun_z = t*tilt*(sun . fall).
        tt = ho3 / (sun[2] + tilt * sun.dot(fall))
        img, depth = project([T3 - tt * sun], R, t, K)
        if tt > 0 and depth[0] > 0:
            row["o3_slope2_sx"], row["o3_slope2_sy"] = img[0]
        lean = horiz(rng2.uniform(0, 360))
        TL = B3 + ho3 * (math.sin(math.radians(2)) * lean + [0, 0, math.cos(math.radians(2))])
        SL = TL - TL[2] / sun[2] * sun
        img, depth = project([TL, SL], R, t, K)
        if np.all(depth > 0):
            row["o3_lean2_tx"], row["o3_lean2_ty"], row["o3_lean2_sx"], row["o3_lean2_sy"] = img.ravel()

        for _ in range(3000):
            b = heading + rng.uniform(-0.9, 0.9) * hfov
            P = C * [1, 1, 0] + rng.uniform(4, 60) * horiz(b)
            img, depth = project([P + [0, 0, rng.uniform(0.0, 1.0)], P + [0, 0, rng.uniform(2, 8)]], R, t, K)
            if inside(img, depth, w, h) and abs(img[0, 1] - img[1, 1]) > 0.05 * h:
                row["e_ax"], row["e_ay"], row["e_bx"], row["e_by"] = img.ravel()
                break

        dip = 1.76 / 60 * math.sqrt(cam_h)
        row["dip"] = dip
        d = [math.cos(math.radians(dip)) * horiz(heading + k * hfov) - [0, 0, math.sin(math.radians(dip))]
             for k in (-0.7, 0.6)]
        img, depth = project([C + 1e7 * v for v in d], R, t, K)
        if inside(img, depth, w, h):
            row["hz_ax"], row["hz_ay"], row["hz_bx"], row["hz_by"] = img.ravel()

        for _ in range(3000):
            b = heading + rng.uniform(-0.9, 0.9) * hfov
            A = C * [1, 1, 0] + rng.uniform(3, 30) * horiz(b)
            bearing = rng.uniform(0, 360)
            Bp = A + rng.uniform(2, 10) * horiz(bearing)
            img, depth = project([A, Bp], R, t, K)
            if inside(img, depth, w, h) and np.hypot(*(img[1] - img[0])) > 0.1 * w:
                row["gl_ax"], row["gl_ay"], row["gl_bx"], row["gl_by"] = img.ravel()
                row["gl_bearing"] = bearing
                break

        if kind == "sun_in_frame":
            img, depth = project([C + 1e7 * sun], R, t, K)
            if not inside(img, depth, w, h):
                continue
            row["sun_x"], row["sun_y"] = img[0]
        return row


COLS = (["scene", "kind", "width", "height", "f35", "f_px", "pitch", "roll", "heading", "cam_h",
         "sun_alt", "sun_az"]
        + [f"o{i}_{n}{c}" for i in (1, 2, 3) for n in "bts" for c in "xy"]
        + ["e_ax", "e_ay", "e_bx", "e_by", "dip", "hz_ax", "hz_ay", "hz_bx", "hz_by",
           "gl_ax", "gl_ay", "gl_bx", "gl_by", "gl_bearing", "sun_x", "sun_y"]
        + [f"o3_rot{r}_s{c}" for r in (10, 20, 40) for c in "xy"]
        + ["o3_slope2_sx", "o3_slope2_sy", "o3_lean2_tx", "o3_lean2_ty", "o3_lean2_sx", "o3_lean2_sy"])

rows = [scene("ground") for _ in range(100)]
rows += [scene("sun_in_frame") for _ in range(16)]
rows += [scene("same_bearing") for _ in range(12)]
out = sys.stdout
out.write(f"# OpenCV {cv2.__version__}, numpy {np.__version__}: cv2.projectPoints (pinhole, no distortion); "
          "generated by gen_scenes.py, do not edit\n")
out.write(",".join(COLS) + "\n")
for i, r in enumerate(rows):
    r["scene"] = i + 1
    out.write(",".join("" if c not in r else (repr(float(r[c])) if isinstance(r[c], (float, np.floating)) else str(r[c]))
                       for c in COLS) + "\n")
