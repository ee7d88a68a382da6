#!/usr/bin/python3
"""Independent check of a `haloweave plan` output folder against the contract (../shared/spec/interfaces.md,
section "Output of `haloweave plan PLAN --out DIR`").

Usage:  contract_check.py DIR [DIR ...] [--profile-dir instrument-profiles]
        contract_check.py --self-test

Written in Python on astropy (checked against astropy 5.2.1, Debian's python3-astropy, with its numpy) and sharing
no code with Haloweave's TypeScript (neither its projection nor its checker in src/core/check/). It reads the
folder's files with Python's csv and json modules only.

Projection: astropy.wcs (wcslib) with CTYPE RA---TAN / DEC--TAN, the gnomonic projection of Calabretta & Greisen
(2002, A&A 395, 1077). CRVAL = the mask (or galaxy) centre, CDELT = +1/3600 deg on both axes, CRPIX = 0, identity PC,
default LONPOLE (180 deg for a zenithal projection off the pole). world -> pixel with origin = 1 (the FITS 1-based
convention) then gives pixel = CDELT^-1 * (intermediate world coordinate), i.e. arcsec; with CDELT1 > 0 the FITS
intermediate x grows towards East (increasing RA), so pixel 1 = xi (East) and pixel 2 = eta (North). Each centre
is first cross-checked by a second astropy route, SkyCoord.directional_offset_by (spherical trigonometry in
astropy.coordinates): a point at separation d and position angle PA must project to radius (180/pi) tan(d) deg
along PA (azimuthal projections keep directions, Calabretta & Greisen sect. 5.1).

Frames (the contract): mask y = xi sin PA + eta cos PA, x = xi cos PA - eta sin PA; galaxy u = xi sin theta +
eta cos theta, v = xi cos theta - eta sin theta, R = sqrt(q u^2 + v^2/q), phi = atan2(v, u).

Tilt convention (from Haloweave's src/core/geometry/slitGeometry.ts doc comment): tilt_deg rotates the slit
rectangle about (x_arcsec, y_arcsec); positive tilt turns the slit's +y direction towards +x, so the unit vector
along the slit is (sin t, cos t) and across it (cos t, -sin t) in (x, y).

Instrument profile of each mask: the masks.csv `instrument` value is a profile id. The profile files that
solved.plan.json names by path (its `instrument`, or each `instruments[].profile` of a plan of several spectrographs,
contract revision 2; a path contains '/' or '\\' or ends in .json), resolved relative to DIR, are tried first, by
their `id` key; then the *.json files of the profile directory (default: instrument-profiles/ of this repository).
With `instruments`, every masks.csv instrument must be the id of one of them, each used by exactly its `masks`
count, and a solved.plan.json mask naming its `instrument` must name the one masks.csv gives.

coverage.json `starlightBins` (co-added integrated starlight per 1 Re x 45 deg bin) is re-derived from the slits, the
plan and the profiles with this checker's own Sersic, AB-flux, CCD-equation and Moon formulas (section
"integrated-starlight bins" below, with their sources).

Output: one line per violation ("WHERE: [rule] what"), exit status 1 if there is any; otherwise a summary (rows
checked, worst position residual) and exit status 0. Exit status 3: astropy missing.
"""
import argparse
import csv
import glob
import itertools
import json
import math
import os
import re
import sys

try:
    import numpy as np
    import astropy
    import astropy.units as u
    from astropy.coordinates import Angle, SkyCoord
    from astropy.wcs import WCS
except ImportError as e:  # a clear message, never a silent pass
    print(f"contract_check: astropy (with numpy) is required for {sys.executable}: {e}. "
          "Install it with: apt-get install -y python3-astropy", file=sys.stderr)
    sys.exit(3)

# ---- the contract's fixed names --------------------------------------------------------------------------------
MASKS_COLUMNS = ["mask_id", "instrument", "ra_deg", "dec_deg", "pa_deg"]
SLITS_COLUMNS = ["mask_id", "slit_id", "object_id", "role", "ra_deg", "dec_deg", "x_arcsec", "y_arcsec",
                 "len_below_arcsec", "len_above_arcsec", "width_arcsec", "tilt_deg", "priority", "mag"]
REPORT_COLUMNS = ["line", "column", "reason"]
ROLES = ["tracer", "starlight", "sky", "alignment"]
SCIENCE_ROLES = ("tracer", "starlight")          # the wavelength rule applies to science slits
SLIT_ROLES = ("tracer", "starlight", "sky")      # the minimal-length rule applies to slits (boxes have their own)
PLAN_FORMAT = "haloweave.plan/1"
C_KMS = 299792.458                               # speed of light, SI definition (km/s)

# ---- tolerances ------------------------------------------------------------------------------------------------
POSITION_TOL_ARCSEC = 1e-3   # the brief: ra/dec must be the point (x, y) to 1e-3 arcsec
LENGTH_TOL_ARCSEC = 1e-6     # lengths, containment, gaps: far below any slit size, far above float rounding
PIXEL_TOL = 1e-6             # wavelength rule, detector pixels
ANGLE_TOL_DEG = 1e-9         # solved.plan.json vs masks.csv (about 4 micro-arcsec)
REACH_TOL = 1e-6             # coverage: largest R/Re (relative)
BIN_EDGE_TOL = 1e-9          # coverage: a point this close to a bin edge may fall in either bin


class Report:
    """Collects violations as printable lines."""

    def __init__(self):
        self.lines = []

    def add(self, where, rule, what):
        self.lines.append(f"{where}: [{rule}] {what}")


# ---- reading ---------------------------------------------------------------------------------------------------

def read_csv(path, name, expected, report):
    """Rows of a CSV file as (1-based line number counting the header, dict); checks the header: the contract's
    columns must come first, exactly named and in order (later extra columns are an allowed extension)."""
    if not os.path.isfile(path):
        report.add(name, "missing-file", f"{path} does not exist")
        return None, []
    with open(path, newline="", encoding="utf-8") as f:
        reader = csv.reader(f)
        try:
            header = next(reader)
        except StopIteration:
            report.add(name, "columns", "the file is empty (no header row)")
            return None, []
        if header and header[0].startswith("\ufeff"):
            header[0] = header[0][1:]
        if header[:len(expected)] != expected:
            report.add(f"{name} line 1", "columns",
                       f"header is {','.join(header)}; the contract needs {','.join(expected)} (in this order)")
        rows = []
        for cells in reader:
            line = reader.line_num
            if not cells:
                continue
            if len(cells) != len(header):
                report.add(f"{name} line {line}", "columns", f"{len(cells)} cells, header has {len(header)}")
            rows.append((line, dict(zip(header, cells))))
    return header, rows


def read_json(path, name, report):
    """A JSON file's content, or None (with a violation) when it is missing or unreadable."""
    if not os.path.isfile(path):
        report.add(name, "missing-file", f"{path} does not exist")
        return None
    try:
        with open(path, encoding="utf-8") as f:
            return json.load(f)
    except (OSError, ValueError) as e:
        report.add(name, "json", f"cannot read: {e}")
        return None


def number(row, col, where, report, allow_empty=False):
    """A finite float from a CSV cell, or None (with a violation unless empty cells are allowed)."""
    text = (row.get(col) or "").strip()
    if text == "" and allow_empty:
        return None
    try:
        value = float(text)
    except ValueError:
        report.add(where, "number", f"{col} is {text!r}, not a number")
        return None
    if not math.isfinite(value):
        report.add(where, "number", f"{col} is {text!r}, not finite")
        return None
    return value


_PLAIN_NUMBER = re.compile(r"^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$")


def ra_deg_of(value):
    """RA in degrees from a plan value: a number (degrees), or sexagesimal text in hours (degrees when marked d/°),
    parsed by astropy.coordinates.Angle."""
    if isinstance(value, (int, float)):
        return float(value)
    text = str(value).strip()
    if _PLAIN_NUMBER.match(text):
        return float(text)
    unit = u.deg if ("d" in text or "\u00b0" in text) else u.hourangle
    return Angle(text, unit=unit).to_value(u.deg)


def dec_deg_of(value):
    """Dec in degrees from a plan value: a number, or sexagesimal degrees parsed by astropy.coordinates.Angle."""
    if isinstance(value, (int, float)):
        return float(value)
    text = str(value).strip()
    if _PLAIN_NUMBER.match(text):
        return float(text)
    return Angle(text, unit=u.deg).to_value(u.deg)


def looks_like_path(value):
    """True when an `instrument` value names a file rather than a profile id."""
    return value.endswith(".json") or "/" in value or "\\" in value


def load_profiles(profile_dir):
    """Profiles of a directory keyed by their `id` key (not by file name)."""
    found = {}
    for path in sorted(glob.glob(os.path.join(profile_dir, "*.json"))):
        try:
            with open(path, encoding="utf-8") as f:
                p = json.load(f)
        except (OSError, ValueError):
            continue
        if isinstance(p, dict) and isinstance(p.get("id"), str):
            found.setdefault(p["id"], (p, path))
    return found


# ---- projection (astropy.wcs) ------------------------------------------------------------------------------------

def tan_wcs(ra0_deg, dec0_deg):
    """A RA---TAN/DEC--TAN WCS about (ra0, dec0) whose 1-based pixel coordinates are (xi East, eta North) in arcsec."""
    w = WCS(naxis=2)
    w.wcs.ctype = ["RA---TAN", "DEC--TAN"]
    w.wcs.crval = [ra0_deg, dec0_deg]
    w.wcs.crpix = [0.0, 0.0]
    w.wcs.cdelt = [1.0 / 3600.0, 1.0 / 3600.0]
    w.wcs.set()
    return w


def sky_to_tangent_arcsec(w, ra_deg, dec_deg):
    """(xi East, eta North) arcsec of sky positions (degree arrays) about the WCS's centre; NaN where unprojectable."""
    ra = np.atleast_1d(np.asarray(ra_deg, dtype=float))
    dec = np.atleast_1d(np.asarray(dec_deg, dtype=float))
    if ra.size == 0:
        return np.zeros(0), np.zeros(0)
    pix = w.wcs_world2pix(np.column_stack([ra, dec]), 1)
    return pix[:, 0], pix[:, 1]


def cross_check_centre(ra0_deg, dec0_deg, where, report):
    """Second astropy route: SkyCoord.directional_offset_by points must land at radius tan(d) along their PA."""
    w = tan_wcs(ra0_deg, dec0_deg)
    centre = SkyCoord(ra0_deg * u.deg, dec0_deg * u.deg, frame="icrs")
    pas = np.array([0.0, 37.0, 90.0, 180.0, 233.0, 270.0])
    sep_deg = 600.0 / 3600.0
    pts = centre.directional_offset_by(pas * u.deg, np.full(pas.shape, sep_deg) * u.deg)
    xi, eta = sky_to_tangent_arcsec(w, pts.ra.deg, pts.dec.deg)
    radius = math.degrees(math.tan(math.radians(sep_deg))) * 3600.0
    exp_xi, exp_eta = radius * np.sin(np.radians(pas)), radius * np.cos(np.radians(pas))
    worst = float(np.max(np.hypot(xi - exp_xi, eta - exp_eta)))
    if not worst < 1e-6:
        report.add(where, "projection-cross-check",
                   f"astropy.wcs TAN and SkyCoord offsets disagree by {worst:.3g} arcsec about ({ra0_deg}, {dec0_deg})")


# ---- geometry (mask frame, arcsec) -------------------------------------------------------------------------------

def row_corners(x, y, below, above, width, tilt_deg):
    """Corners of a row (mask frame): the rectangle x +- width/2, y - below .. y + above about (x, y), turned by
    tilt_deg about (x, y), positive taking +y towards +x. Order: lower-left, lower-right, upper-right, upper-left."""
    t = math.radians(tilt_deg)
    ax, ay = math.sin(t), math.cos(t)      # along the slit
    cx, cy = math.cos(t), -math.sin(t)     # across the slit
    h = width / 2.0
    out = []
    for across, along in ((-h, -below), (h, -below), (h, above), (-h, above)):
        out.append((x + across * cx + along * ax, y + across * cy + along * ay))
    return out


def _dist_point_segment(p, a, b):
    """Distance from point p to segment ab."""
    dx, dy = b[0] - a[0], b[1] - a[1]
    L2 = dx * dx + dy * dy
    if L2 == 0.0:
        return math.hypot(p[0] - a[0], p[1] - a[1])
    s = max(0.0, min(1.0, ((p[0] - a[0]) * dx + (p[1] - a[1]) * dy) / L2))
    return math.hypot(p[0] - a[0] - s * dx, p[1] - a[1] - s * dy)


def on_boundary(p, poly, tol):
    """True when p lies within tol of an edge of the closed polygon."""
    n = len(poly)
    return any(_dist_point_segment(p, poly[i], poly[(i + 1) % n]) <= tol for i in range(n))


def point_in_polygon(p, poly, tol=LENGTH_TOL_ARCSEC):
    """Inside-or-on test for a simple polygon, convex or not: on the boundary (within tol) counts as inside,
    otherwise the even-odd rule of a ray towards +x."""
    if on_boundary(p, poly, tol):
        return True
    x, y = p
    inside = False
    n = len(poly)
    for i in range(n):
        (x1, y1), (x2, y2) = poly[i], poly[(i + 1) % n]
        if (y1 > y) != (y2 > y):
            xc = x1 + (y - y1) * (x2 - x1) / (y2 - y1)
            if xc > x:
                inside = not inside
    return inside


def _cross(o, a, b):
    return (a[0] - o[0]) * (b[1] - o[1]) - (a[1] - o[1]) * (b[0] - o[0])


def segments_cross_properly(a, b, c, d, tol=LENGTH_TOL_ARCSEC):
    """True when segments ab and cd cross at one point interior to both (touching or overlapping within tol is not
    a crossing): each segment's ends lie strictly on opposite sides of the other's line."""
    lab, lcd = math.hypot(b[0] - a[0], b[1] - a[1]), math.hypot(d[0] - c[0], d[1] - c[1])
    if lab == 0.0 or lcd == 0.0:
        return False
    d1, d2 = _cross(a, b, c) / lab, _cross(a, b, d) / lab     # signed distances of c, d from line ab
    d3, d4 = _cross(c, d, a) / lcd, _cross(c, d, b) / lcd     # signed distances of a, b from line cd
    return ((d1 > tol and d2 < -tol) or (d1 < -tol and d2 > tol)) and \
           ((d3 > tol and d4 < -tol) or (d3 < -tol and d4 > tol))


def _segment_hits(a, b, c, d):
    """Parameters t in [0, 1] along ab where it meets segment cd (both ends of a collinear overlap)."""
    rx, ry = b[0] - a[0], b[1] - a[1]
    sx, sy = d[0] - c[0], d[1] - c[1]
    den = rx * sy - ry * sx
    qx, qy = c[0] - a[0], c[1] - a[1]
    L2 = rx * rx + ry * ry
    if abs(den) < 1e-15 * max(1.0, L2):
        if abs(qx * ry - qy * rx) > 1e-12 * max(1.0, L2):
            return []                                           # parallel, not collinear
        t0 = (qx * rx + qy * ry) / L2
        t1 = ((d[0] - a[0]) * rx + (d[1] - a[1]) * ry) / L2
        lo, hi = max(0.0, min(t0, t1)), min(1.0, max(t0, t1))
        return [lo, hi] if lo <= hi else []
    t = (qx * sy - qy * sx) / den
    s = (qx * ry - qy * rx) / den
    return [t] if -1e-12 <= t <= 1 + 1e-12 and -1e-12 <= s <= 1 + 1e-12 else []


def quad_in_polygon(corners, poly, tol=LENGTH_TOL_ARCSEC):
    """Why a convex quadrilateral is not inside a simple (possibly non-convex) polygon, or None when it is
    (boundary contact within tol allowed). Tests: every corner inside-or-on; no quad edge properly crosses a polygon
    edge; every piece of each quad edge between its meeting points with the polygon boundary is inside (catches edges
    that leave through a vertex); no polygon vertex strictly inside the quad (catches a notch poking in)."""
    for k, c in enumerate(corners):
        if not point_in_polygon(c, poly, tol):
            return f"corner {k + 1} ({c[0]:.4f}, {c[1]:.4f}) is outside the footprint"
    n = len(poly)
    for k in range(4):
        a, b = corners[k], corners[(k + 1) % 4]
        ts = [0.0, 1.0]
        for i in range(n):
            c, d = poly[i], poly[(i + 1) % n]
            if segments_cross_properly(a, b, c, d, tol):
                return (f"edge {k + 1}-{(k + 1) % 4 + 1} crosses footprint edge "
                        f"({c[0]}, {c[1]})-({d[0]}, {d[1]})")
            ts.extend(_segment_hits(a, b, c, d))
        ts = sorted(min(1.0, max(0.0, t)) for t in ts)
        for t0, t1 in zip(ts, ts[1:]):
            if t1 - t0 < 1e-12:
                continue
            tm = (t0 + t1) / 2
            m = (a[0] + tm * (b[0] - a[0]), a[1] + tm * (b[1] - a[1]))
            if not point_in_polygon(m, poly, tol):
                return f"edge {k + 1}-{(k + 1) % 4 + 1} leaves the footprint near ({m[0]:.4f}, {m[1]:.4f})"
    for v in poly:
        if _strictly_inside_convex(v, corners, tol):
            return f"footprint vertex ({v[0]}, {v[1]}) lies inside the row's rectangle"
    return None


def _strictly_inside_convex(p, quad, tol):
    """True when p is inside the convex quad by more than tol from each edge."""
    signs = []
    for k in range(4):
        a, b = quad[k], quad[(k + 1) % 4]
        L = math.hypot(b[0] - a[0], b[1] - a[1])
        if L == 0.0:
            return False
        signs.append(_cross(a, b, p) / L)
    return all(sg > tol for sg in signs) or all(sg < -tol for sg in signs)


# ---- the wavelength rule ------------------------------------------------------------------------------------------

def detector_pixel(x_arcsec, wavelength_a, det):
    """p = pixels/2 + x/xArcsecPerPixel + (L - centralWavelengthA)/dispersionAPerPixel (the contract)."""
    return det["pixels"] / 2.0 + x_arcsec / det["xArcsecPerPixel"] + \
        (wavelength_a - det["centralWavelengthA"]) / det["dispersionAPerPixel"]


def line_windows_a(lines_rest_a, vsys_kms, dv_kms, half_window_a):
    """Observed window of each rest line over v_sys +- dv, widened by the half-window (contract revision 2)."""
    return [(L, L * (1.0 + (vsys_kms - dv_kms) / C_KMS) - half_window_a,
             L * (1.0 + (vsys_kms + dv_kms) / C_KMS) + half_window_a) for L in lines_rest_a]


def wavelength_problem(x_arcsec, windows, det):
    """Why a science slit at mask x fails the wavelength rule, or None. windows: (rest, lo, hi) in Angstrom."""
    m = det["edgeMarginPixels"]
    for rest, lo, hi in windows:
        p0, p1 = detector_pixel(x_arcsec, lo, det), detector_pixel(x_arcsec, hi, det)
        what = f"line {rest} A, window {lo:.3f}-{hi:.3f} A, lands on pixels {p0:.2f}-{p1:.2f}"
        if p0 < m - PIXEL_TOL or p1 > det["pixels"] - m + PIXEL_TOL:
            return f"{what}, outside [{m}, {det['pixels'] - m}]"
        for g0, g1 in det.get("gapsPixels", []):
            if p1 > g0 - m + PIXEL_TOL and p0 < g1 + m - PIXEL_TOL:
                return f"{what}, closer than {m} pixels to the gap [{g0}, {g1}]"
    return None


# ---- coverage ----------------------------------------------------------------------------------------------------

def fold_azimuth_deg(phi_deg, span_deg):
    """Azimuth in [0, 360) folded into [0, span): 360 = no fold, 180 = point symmetry, 90 = both axes."""
    if span_deg >= 360 - 1e-9:
        return phi_deg
    if abs(span_deg - 180) < 1e-9:
        return phi_deg % 180.0
    if abs(span_deg - 90) < 1e-9:
        f = phi_deg % 180.0
        return 180.0 - f if f > 90.0 else f
    return None


def check_bins(name, bins, values, lo_key, hi_key, where, report):
    """Counts per [lo, hi) bin agree with the recomputed values (a value within BIN_EDGE_TOL of an edge may be in
    either neighbouring bin)."""
    for i, b in enumerate(bins):
        lo, hi, count = b.get(lo_key), b.get(hi_key), b.get("count")
        if not all(isinstance(z, (int, float)) for z in (lo, hi, count)):
            report.add(where, "coverage", f"{name} bin {i} lacks numeric {lo_key}/{hi_key}/count: {b}")
            continue
        sure = sum(1 for v in values if lo + BIN_EDGE_TOL <= v < hi - BIN_EDGE_TOL)
        maybe = sum(1 for v in values if lo - BIN_EDGE_TOL <= v < hi + BIN_EDGE_TOL)
        if not sure <= count <= maybe:
            report.add(where, "coverage",
                       f"{name} bin [{lo}, {hi}) says {count}; recomputed from slits.csv: {sure}"
                       + (f" to {maybe}" if maybe != sure else ""))


def check_coverage(cov, galaxy, goals, slit_rows, report):
    """coverage.json against the slits.csv positions in the galaxy frame (layout of Haloweave's
    src/core/coverage/coverage.ts: roles.<role>.{goalRe, count, radialBins[{fromRe,toRe,count}],
    sectors[{fromDeg,toDeg,count}], maxReachRe}, sectorConvention.{count, widthDeg, folded})."""
    where = "coverage.json"
    if not isinstance(cov, dict):
        report.add(where, "coverage", "not a JSON object")
        return
    conv = cov.get("sectorConvention") if isinstance(cov.get("sectorConvention"), dict) else {}
    folded = conv.get("folded")
    if not isinstance(folded, bool):
        report.add(where, "coverage", "sectorConvention.folded must state (true/false) whether the sectors are folded")
    roles = cov.get("roles")
    if not isinstance(roles, dict):
        report.add(where, "coverage", "no `roles` object")
        return
    w = tan_wcs(galaxy["raDeg"], galaxy["decDeg"])
    th, q, re_arcsec = math.radians(galaxy["paDeg"]), galaxy["axisRatio"], galaxy["reArcsec"]
    for role in ROLES:
        rc = roles.get(role)
        rwhere = f"{where} roles.{role}"
        if not isinstance(rc, dict):
            report.add(rwhere, "coverage", "missing (the contract wants every role)")
            continue
        rows = [r for r in slit_rows if r["role"] == role]
        xi, eta = sky_to_tangent_arcsec(w, [r["ra"] for r in rows], [r["dec"] for r in rows])
        uu = xi * math.sin(th) + eta * math.cos(th)
        vv = xi * math.cos(th) - eta * math.sin(th)
        r_re = [float(z) for z in np.sqrt(q * uu ** 2 + vv ** 2 / q) / re_arcsec]
        phi = [float(z) % 360.0 for z in np.degrees(np.arctan2(vv, uu))]
        if rc.get("count") is not None and rc.get("count") != len(rows):
            report.add(rwhere, "coverage", f"count {rc.get('count')}, slits.csv has {len(rows)} {role} rows")
        goal = goals.get("starlightReachRe" if role == "starlight" else "tracerReachRe")
        goal_re = rc.get("goalRe", goal)
        if role in SCIENCE_ROLES and isinstance(goal, (int, float)) and goal_re != goal:
            report.add(rwhere, "coverage", f"goalRe {goal_re}, the plan's goal is {goal}")
        bins = rc.get("radialBins")
        if not isinstance(bins, list) or not isinstance(goal_re, (int, float)):
            report.add(rwhere, "coverage", "no radialBins list / goalRe")
        else:
            n_expected = max(0, math.ceil(goal_re - 1e-12))
            edges_ok = len(bins) == n_expected and all(
                isinstance(b, dict) and abs(b.get("fromRe", -1) - i) < 1e-12
                and abs(b.get("toRe", -1) - min(i + 1, goal_re)) < 1e-12 for i, b in enumerate(bins))
            if not edges_ok:
                report.add(rwhere, "coverage",
                           f"radial bins must be 1 Re wide from 0 out to the goal {goal_re} Re "
                           f"({n_expected} bins); found {[(b.get('fromRe'), b.get('toRe')) for b in bins if isinstance(b, dict)]}")
            check_bins(f"{role} radial", [b for b in bins if isinstance(b, dict)], r_re, "fromRe", "toRe", rwhere, report)
            beyond = rc.get("beyondGoal")   # Haloweave's extension: rows at or beyond the goal radius
            if isinstance(beyond, (int, float)):
                sure = sum(1 for v in r_re if v >= goal_re + BIN_EDGE_TOL)
                maybe = sum(1 for v in r_re if v >= goal_re - BIN_EDGE_TOL)
                if not sure <= beyond <= maybe:
                    report.add(rwhere, "coverage", f"beyondGoal {beyond}; recomputed from slits.csv: {sure}"
                               + (f" to {maybe}" if maybe != sure else ""))
        sectors = rc.get("sectors")
        if not isinstance(sectors, list) or len(sectors) != 8:
            report.add(rwhere, "coverage", f"needs 8 azimuthal sectors, found {len(sectors) if isinstance(sectors, list) else 'none'}")
        else:
            span = max((sec.get("toDeg", 0) for sec in sectors if isinstance(sec, dict)), default=0)
            widths_ok = all(isinstance(sec, dict) and abs((sec.get("toDeg", 0) - sec.get("fromDeg", 0)) - 45) < 1e-9
                            for sec in sectors)
            if not widths_ok:
                report.add(rwhere, "coverage", "sectors must be 45 degrees wide")
            if folded is False and abs(span - 360) > 1e-9:
                report.add(rwhere, "coverage", f"sectors not folded but they end at {span} deg, not 360")
            phis = [fold_azimuth_deg(p, span if folded else 360.0) for p in phi]
            if any(p is None for p in phis):
                report.add(rwhere, "coverage", f"cannot fold azimuths into sectors ending at {span} deg")
            else:
                # a sector edge at 0 = 360: an azimuth within tolerance below 360 may be counted in the first sector
                wrapped = [p - 360.0 if p > 360.0 - BIN_EDGE_TOL else p for p in phis]
                check_bins(f"{role} sector", [sec for sec in sectors if isinstance(sec, dict)], wrapped, "fromDeg", "toDeg", rwhere, report)
        reach = rc.get("maxReachRe")
        expected = max(r_re) if r_re else 0.0
        if not isinstance(reach, (int, float)):
            report.add(rwhere, "coverage", "no numeric maxReachRe (largest R/Re reached)")
        elif abs(reach - expected) > REACH_TOL * max(1.0, expected):
            report.add(rwhere, "coverage", f"maxReachRe {reach}, recomputed from slits.csv {expected}")


# ---- integrated-starlight bins (coverage.json starlightBins) -----------------------------------------------------
# Re-derived from slits.csv, masks.csv, solved.plan.json and each mask's instrument profile with this checker's own
# formulas, from the definitions in Haloweave's docs/signal-to-noise.md and docs/contract-check.md:
# - Sersic profile (Sersic 1968): mu(R) = muE + 2.5 b_n / ln 10 [(R/Re)^(1/n) - 1] in the catalog's band, R the
#   circularised radius; b_n the root of Gamma(2n) = 2 gamma(2n, b_n) (Graham & Driver 2005, PASA 22, 118;
#   they list b_1 = 1.678, b_4 = 7.669, checked in the self-test); a slit part's mean surface brightness is the flux
#   mean over 5 points at the centres of 5 equal pieces along it.
# - AB magnitudes (Oke & Gunn 1983): f_nu = 3631 Jy 10^(-0.4 m); photons s^-1 cm^-2 A^-1 = f_nu / (h lambda).
# - Howell's CCD equation (Handbook of CCD Astronomy, 2nd ed. 2006, sec. 4.4; Howell 1989, PASP 101, 616) per A of
#   spectrum: variance = N* + n_pix (1 + n_pix/n_B)(N_S + N_D + N_R^2), n_pix = length / yArcsecPerPixel /
#   dispersionAPerPixel, n_B the same for the mask's sky slits (their total length).
# - Co-adding (docs/signal-to-noise.md, sky floor): S/N = sum N* / sqrt(sum variance + (f sum n_pix N_S)^2), f the
#   systematic sky-subtraction fraction (observing.skySystematicFraction, default 0.01).
# - The sky: starlight.skyMagPerArcsec2 (AB) plus the Moon (Krisciunas & Schaefer 1991, PASP 103, 1033), given in
#   observing.moon or computed for observing.date / dateRange with astropy's ephemerides (dated_moon).
# - Spectra: each starlight slit whole; each tracer slit's two parts beside its extraction of 2 seeing FWHM centred on
#   the tracer, inside the starlight goal radius (R/Re of the part's midpoint); none from a mask without sky slits.
#   A spectrum's bin: floor(R/Re) and 45-degree sector of the azimuth from the major axis towards +v (not folded), at
#   its midpoint. A mask point is placed as the model defines it: the galaxy centre projected (TAN, astropy.wcs) into
#   the mask frame, the point's offset from it turned to the sky by the mask PA and to the galaxy frame by its PA.
STARLIGHT_DEFAULTS = {"exposureS": 7200.0, "skyMagPerArcsec2": 19.6, "targetSnPerA": 5.0, "throughput": 0.15}
OBSERVING_DEFAULT_SEEING_ARCSEC = 0.8
DEFAULT_SKY_FLOOR = 0.01
POINT_EXTRACTION_FWHM = 2.0
AB_MINUS_VEGA = {"I": 0.45, "i": 0.37, "z": 0.54, "R": 0.21, "V": 0.02}  # Blanton & Roweis 2007, AJ 133, 734, Table 1
PLANCK_ERG_S = 6.62607015e-27                    # SI 2019 exact
AB_ZERO_CGS = 3631e-23                           # 3631 Jy in erg s^-1 cm^-2 Hz^-1
SN_ABS_TOL = 0.011     # S/N per A: written to 0.01
SN_REL_TOL = 1e-3      # ... from slit ends written to 1e-4 arcsec
REACH_ABS_TOL_RE = 3e-4   # reachRe: written to 1e-4 Re
POS_TOL_ARCSEC = 0.01  # a spectrum this close to a bin edge (radial, or along the azimuth) may be in either bin
MAX_EDGE_LAYOUTS = 1024   # most layouts (a bin for each edge case) tried; further edge cases stay in their own bin


def lower_gamma_p(a, x):
    """Regularised lower incomplete gamma P(a, x) by its power series (converges for every x >= 0)."""
    if x <= 0:
        return 0.0
    term = 1.0 / a
    total = term
    k = 1
    while k < 100000:
        term *= x / (a + k)
        total += term
        if term < total * 1e-17:
            break
        k += 1
    return math.exp(a * math.log(x) - x - math.lgamma(a)) * total


def sersic_bn(n):
    """b_n with P(2n, b_n) = 1/2 (Graham & Driver 2005), by bisection."""
    lo, hi = 0.0, 4.0 * n + 10.0
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if lower_gamma_p(2.0 * n, mid) < 0.5:
            lo = mid
        else:
            hi = mid
    return 0.5 * (lo + hi)


def moon_sky_nanolambert(phase_deg, sep_deg, moon_zenith_deg, target_zenith_deg, k_v):
    """Moonlight at the target, nanoLamberts (Krisciunas & Schaefer 1991, PASP 103, 1033, eqs. 3, 15, 20, 21)."""
    if moon_zenith_deg >= 90:
        return 0.0
    airmass = lambda z: (1 - 0.96 * math.sin(math.radians(z)) ** 2) ** -0.5
    a = abs(phase_deg)
    i_star = 10 ** (-0.4 * (-12.73 + 0.026 * a + 4e-9 * a ** 4 + 16.57))
    f_rho = 6.2e7 / sep_deg ** 2 if sep_deg < 10 else \
        10 ** 5.36 * (1.06 + math.cos(math.radians(sep_deg)) ** 2) + 10 ** (6.15 - sep_deg / 40)
    return f_rho * i_star * 10 ** (-0.4 * k_v * airmass(moon_zenith_deg)) * (1 - 10 ** (-0.4 * k_v * airmass(target_zenith_deg)))


def dated_moon(obs, galaxy, site):
    """The Moon of observing.date / dateRange by astropy (get_body: its built-in lunar and solar ephemerides; no
    download, UT1 taken as UTC beyond the bundled IERS table): the design moment is the given UTC instant, or on the
    night (local evening date; the middle night of a range, the earlier of two) the moment nearest local mean midnight
    (date + 1 day - longitude/360) when the galaxy's hour angle (mean place of date, FK5) is observing.designHourAngleH
    (default 0). Returns the phase angle (geocentric Sun and Moon), the topocentric Moon-galaxy separation, the Moon's
    and the galaxy's geometric altitudes (degrees); None when the date cannot be read."""
    from astropy.utils import iers
    from astropy.time import Time
    from astropy.coordinates import AltAz, EarthLocation, FK5, get_body
    import datetime
    import warnings
    iers.conf.auto_download = False
    iers.conf.iers_degraded_accuracy = "ignore"
    try:
        ra, dec = ra_deg_of(galaxy["ra"]), dec_deg_of(galaxy["dec"])
        loc = EarthLocation.from_geodetic(site["lonDeg"] * u.deg, site["latDeg"] * u.deg, site.get("elevationM", 0) * u.m)
        gal = SkyCoord(ra * u.deg, dec * u.deg)
        text = obs.get("date")
        with warnings.catch_warnings():
            warnings.simplefilter("ignore")
            if isinstance(text, str) and "T" in text:
                t = Time(text.strip().rstrip("Zz").replace(" ", ""), scale="utc")
            else:
                if text is None:
                    a, z = (datetime.date.fromisoformat(d) for d in obs["dateRange"])
                    text = (a + datetime.timedelta(days=((z - a).days) // 2)).isoformat()
                mid = Time(text.strip() + "T00:00:00", scale="utc") + (1 - site["lonDeg"] / 360.0) * u.day
                lst = mid.sidereal_time("apparent", longitude=site["lonDeg"] * u.deg).deg
                ra_date = gal.transform_to(FK5(equinox=mid)).ra.deg
                ha_deg = obs.get("designHourAngleH", 0) * 15.0 - (lst - ra_date)
                t = mid + (((ha_deg + 180.0) % 360.0 - 180.0) / 360.98564736629) * u.day
            moon_topo = get_body("moon", t, loc)
            frame = AltAz(obstime=t, location=loc)
            moon_geo, sun_geo = get_body("moon", t), get_body("sun", t)
            elong = sun_geo.separation(moon_geo).rad
            r_sun, r_moon = sun_geo.distance.to(u.km).value, moon_geo.distance.to(u.km).value
            return {"phaseAngleDeg": math.degrees(math.atan2(r_sun * math.sin(elong), r_moon - r_sun * math.cos(elong))),
                    "separationDeg": moon_topo.separation(gal).deg,
                    "altitudeDeg": moon_topo.transform_to(frame).alt.deg,
                    "galaxyAltitudeDeg": gal.transform_to(frame).alt.deg}
    except (KeyError, TypeError, ValueError) as e:
        print(f"contract_check: the Moon of observing.date could not be computed ({e}); starlight S/N not re-derived",
              file=sys.stderr)
        return None


def plan_sky_ab(plan, prof, dark_ab):
    """The sky of the starlight measure (AB mag/arcsec^2): the dark sky plus a Moon given in observing.moon, summed in
    flux; the Moon's V light (K&S 1991; V = (20.7233 - ln(B / 34.08)) / 0.92104) moved to the catalog band with the
    Sun's V - I = 0.70 and the band's AB - Vega (docs/signal-to-noise.md); with a given Moon the galaxy is taken at
    transit. A Moon of observing.date / dateRange comes from dated_moon (None when it cannot be computed)."""
    obs = plan.get("observing") if isinstance(plan.get("observing"), dict) else {}
    moon = obs.get("moon")
    if moon:
        dec = dec_deg_of(plan["galaxy"]["dec"])
        target_zenith = min(89.0, abs(prof["site"]["latDeg"] - dec))
        b = moon_sky_nanolambert(moon["phaseAngleDeg"], moon["separationDeg"], 90 - moon["altitudeDeg"], target_zenith,
                                 moon.get("extinctionV", 0.15))
    elif obs.get("date") is not None or obs.get("dateRange"):
        geo = dated_moon(obs, plan["galaxy"], prof["site"])
        if geo is None:
            return None
        b = moon_sky_nanolambert(geo["phaseAngleDeg"], geo["separationDeg"], 90 - geo["altitudeDeg"],
                                 min(89.0, 90 - geo["galaxyAltitudeDeg"]), 0.15)
    else:
        return dark_ab
    if not b > 0:
        return dark_ab
    ph = plan.get("photometry") if isinstance(plan.get("photometry"), dict) else None
    if ph is not None and ph.get("system") == "Vega":
        band_ab_vega = ph["abMinusVegaMag"] if "abMinusVegaMag" in ph else AB_MINUS_VEGA[ph["band"]]
    else:
        band_ab_vega = AB_MINUS_VEGA.get((ph or {}).get("band"), AB_MINUS_VEGA["I"])
    moon_ab = (20.7233 - math.log(b / 34.08)) / 0.92104 - 0.70 + band_ab_vega
    return -2.5 * math.log10(10 ** (-0.4 * dark_ab) + 10 ** (-0.4 * moon_ab))


def photons_per_s_cm2_a(mag_ab, wavelength_a):
    """Photon flux density of an AB magnitude: f_nu / (h lambda), per Angstrom."""
    return AB_ZERO_CGS * 10 ** (-0.4 * mag_ab) / (PLANCK_ERG_S * wavelength_a * 1e-8) * 1e-8


def howell_sn(n_star, n_pix, sky_e, dark_e, read_e, n_b=None):
    """Howell's CCD equation with the sky-estimate term (n_b None: sky known exactly)."""
    k = 1.0 if n_b is None else 1.0 + n_pix / n_b
    return n_star / math.sqrt(n_star + n_pix * k * (sky_e + dark_e + read_e ** 2))


def starlight_model(plan, prof):
    """Exposure and detector numbers of the starlight measure for one profile (plan keys, profile, documented defaults)."""
    sl = plan.get("starlight") if isinstance(plan.get("starlight"), dict) else {}
    obs = plan.get("observing") if isinstance(plan.get("observing"), dict) else {}
    det, tel = prof["detector"], prof["telescope"]
    vsys = float(plan["galaxy"]["vsysKms"])
    lines = [L * (1 + vsys / C_KMS) for L in plan["goals"]["linesA"]]
    ph = plan.get("photometry") if isinstance(plan.get("photometry"), dict) else None
    if ph is None or ph.get("system") == "AB":
        to_ab = 0.0
    else:
        to_ab = ph["abMinusVegaMag"] if "abMinusVegaMag" in ph else AB_MINUS_VEGA[ph["band"]]
    ext_s = obs.get("exposureTimeS", sl.get("exposureS", STARLIGHT_DEFAULTS["exposureS"]))
    obstructed = sl.get("obstructedFraction", 0.0)
    area_cm2 = math.pi * (tel["apertureM"] * 50.0) ** 2 * (1 - obstructed)
    sky = plan_sky_ab(plan, prof, sl.get("skyMagPerArcsec2", STARLIGHT_DEFAULTS["skyMagPerArcsec2"]))
    return {
        "toAb": to_ab, "sky": sky if sky is not None else STARLIGHT_DEFAULTS["skyMagPerArcsec2"], "skyUnknown": sky is None,
        "t": float(ext_s), "seeing": obs.get("seeingFwhmArcsec", OBSERVING_DEFAULT_SEEING_ARCSEC),
        "eff": area_cm2 * sl.get("throughput", tel.get("throughput", STARLIGHT_DEFAULTS["throughput"])),
        "disp": det["dispersionAPerPixel"],
        "yScale": sl.get("yArcsecPerPixel", det.get("yArcsecPerPixel", det["xArcsecPerPixel"])),
        "read": sl.get("readNoiseE", det.get("readNoiseE", 3.0)),
        "dark": sl.get("darkEPerPixelPerS", det.get("darkEPerPixelPerS", 0.001)),
        "wl": sl.get("wavelengthA", sum(lines) / len(lines)),
    }


def spectrum_electrons(mu_ab, length, width, sky_length, m):
    """(signal, variance, sky) electrons per A of galaxy light of mean mu_ab over length x width arcsec."""
    per_pix_scale = m["eff"] * m["t"]
    signal = photons_per_s_cm2_a(mu_ab, m["wl"]) * length * width * per_pix_scale
    n_pix = length / m["yScale"] / m["disp"]
    n_b = sky_length / m["yScale"] / m["disp"]
    sky_e = photons_per_s_cm2_a(m["sky"], m["wl"]) * width * m["yScale"] * m["disp"] * per_pix_scale
    k = 1.0 + n_pix / n_b
    var = signal + n_pix * k * (sky_e + m["dark"] * m["t"] + m["read"] ** 2)
    return signal, var, n_pix * sky_e


def mask_points_to_galaxy(mask, gal, xs, ys):
    """(R/Re, azimuth deg in [0, 360)) of mask-frame points as the model places them (docs/signal-to-noise.md): the
    galaxy centre projected (TAN about the mask centre, astropy.wcs) into the mask frame, each point's offset from it
    turned to the sky by the mask PA (xi = dx cos PA + dy sin PA, eta = -dx sin PA + dy cos PA, the inverse of the
    contract's mask frame) and to the galaxy frame by the contract's u, v."""
    pa = math.radians(mask["pa"])
    gxi, geta = sky_to_tangent_arcsec(mask["wcs"], [gal["raDeg"]], [gal["decDeg"]])
    gx = gxi[0] * math.cos(pa) - geta[0] * math.sin(pa)
    gy = gxi[0] * math.sin(pa) + geta[0] * math.cos(pa)
    dx, dy = np.asarray(xs, float) - gx, np.asarray(ys, float) - gy
    xi = dx * math.cos(pa) + dy * math.sin(pa)
    eta = -dx * math.sin(pa) + dy * math.cos(pa)
    th = math.radians(gal["paDeg"])
    uu = xi * math.sin(th) + eta * math.cos(th)
    vv = xi * math.cos(th) - eta * math.sin(th)
    q = gal["axisRatio"]
    r_re = np.sqrt(q * uu * uu + vv * vv / q) / gal["reArcsec"]
    phi = np.degrees(np.arctan2(vv, uu)) % 360.0
    return r_re, phi


def edge_candidates(r_re, phi_deg, re_arcsec):
    """Bins (fromRe, sectorDeg) a spectrum at (R/Re, azimuth) may be in, its own first: near an edge, the neighbour too."""
    r0, s0 = math.floor(r_re), 45 * int(phi_deg // 45)
    radial, sector = [r0], [s0 % 360]
    for edge in (r0, r0 + 1):
        if abs(r_re - edge) * re_arcsec < POS_TOL_ARCSEC:
            radial.append(edge - 1 if edge == r0 else edge)
    r_arcsec = max(r_re * re_arcsec, 1e-9)
    for edge in (s0, s0 + 45):
        gap = min(abs(phi_deg - edge), 360 - abs(phi_deg - edge))
        if math.radians(gap) * r_arcsec < POS_TOL_ARCSEC:
            sector.append((edge - 45) % 360 if edge == s0 else edge % 360)
    return [(a, b) for a in radial if a >= 0 for b in sector]


def binned_spectra(plan, gal, masks, per_mask):
    """Every spectrum holding galaxy light: dicts of bin candidates, kind and electrons (see the section comment)."""
    n = float(gal["sersicN"])
    bn = sersic_bn(n)
    goal = float(plan["goals"]["starlightReachRe"])
    out, models = [], {}
    for mid, rows in per_mask.items():
        mask = masks[mid]
        m = models.setdefault(id(mask["profile"]), starlight_model(plan, mask["profile"]))
        sky_length = sum(r["below"] + r["above"] for r in rows if r["role"] == "sky")
        if sky_length <= 0:
            continue
        ext = POINT_EXTRACTION_FWHM * m["seeing"]
        parts = []
        for r in rows:
            lo, hi = r["y"] - r["below"], r["y"] + r["above"]
            if r["role"] == "starlight":
                parts.append((r, lo, hi, "starlight"))
            elif r["role"] == "tracer":
                parts.append((r, lo, max(lo, r["y"] - ext / 2), "tracer"))
                parts.append((r, min(hi, r["y"] + ext / 2), hi, "tracer"))
        for r, y0, y1, kind in parts:
            if not y1 - y0 > 0:
                continue
            ys = [0.5 * (y0 + y1)] + [y0 + (i + 0.5) / 5 * (y1 - y0) for i in range(5)]
            rr, phi = mask_points_to_galaxy(mask, gal, [r["x"]] * 6, ys)
            r_mid, phi_mid = float(rr[0]), float(phi[0])
            if kind == "tracer" and (r_mid - goal) * gal["reArcsec"] > POS_TOL_ARCSEC:
                continue
            mu = [gal["muE"] + 2.5 * bn / math.log(10) * (x ** (1.0 / n) - 1) for x in rr[1:]]
            mean_mu = -2.5 * math.log10(sum(10 ** (-0.4 * v) for v in mu) / 5)
            s, v, sky = spectrum_electrons(mean_mu + m["toAb"], y1 - y0, r["width"], sky_length, m)
            cands = edge_candidates(r_mid, phi_mid, gal["reArcsec"])
            if kind == "tracer" and abs(r_mid - goal) * gal["reArcsec"] < POS_TOL_ARCSEC:
                cands = cands + [None] if r_mid <= goal else [None] + cands   # at the goal radius: counted or not
            out.append({"cands": cands, "kind": kind, "r": r_mid, "part": (s, v, sky), "where": r["where"]})
    return out, bn, models


def coadd(parts, f):
    s = sum(p[0] for p in parts)
    v = sum(p[1] for p in parts)
    sky = sum(p[2] for p in parts)
    return (s / math.sqrt(v + (f * sky) ** 2), s / math.sqrt(v)) if v > 0 else (0.0, 0.0)


def within(value, lo, hi, rel=SN_REL_TOL, abs_tol=SN_ABS_TOL):
    return isinstance(value, (int, float)) and lo - abs_tol - rel * abs(lo) <= value <= hi + abs_tol + rel * abs(hi)


def check_starlight_bins(cov, plan, masks, per_mask, report):
    """coverage.json starlightBins against a re-derivation from the slits, the plan and the profiles."""
    where0 = "coverage.json starlightBins"
    goals = plan.get("goals", {})
    goal = goals.get("starlightReachRe", 0)
    sb = cov.get("starlightBins")
    if not goal or goal <= 0:
        if sb is not None and sb.get("bins"):
            report.add(where0, "starlight-bins", f"{len(sb['bins'])} bins, but goals.starlightReachRe is {goal} (starlight off)")
        return ""
    if not isinstance(sb, dict) or not isinstance(sb.get("bins"), list):
        report.add(where0, "starlight-bins", "missing (co-added starlight per bin of 1 Re x 45 deg)")
        return ""
    try:
        g = plan["galaxy"]
        gal = {"raDeg": ra_deg_of(g["ra"]), "decDeg": dec_deg_of(g["dec"]), "paDeg": float(g["paDeg"]),
               "axisRatio": float(g["axisRatio"]), "reArcsec": float(g["reArcsec"]), "sersicN": float(g["sersicN"]),
               "muE": float(g["muE"])}
    except (KeyError, TypeError, ValueError) as e:
        report.add("solved.plan.json galaxy", "starlight-bins", f"cannot read the galaxy's light profile: {e}")
        return ""
    sl = plan.get("starlight") if isinstance(plan.get("starlight"), dict) else {}
    obs = plan.get("observing") if isinstance(plan.get("observing"), dict) else {}
    target = float(sl.get("targetSnPerA", STARLIGHT_DEFAULTS["targetSnPerA"]))
    f = float(obs.get("skySystematicFraction", DEFAULT_SKY_FLOOR))
    for key, want in (("targetSnPerA", target), ("skySystematicFraction", f), ("goalRe", goal)):
        if not isinstance(sb.get(key), (int, float)) or abs(sb[key] - want) > 1e-9:
            report.add(f"{where0}.{key}", "starlight-bins", f"{json.dumps(sb.get(key))}, but solved.plan.json gives {want}")
    spectra, bn, models = binned_spectra(plan, gal, masks, per_mask)
    sky_unknown = any(m["skyUnknown"] for m in models.values())
    first_model = next(iter(models.values()), None)
    file_bins = {}
    for i, b in enumerate(sb["bins"]):
        bwhere = f"{where0}.bins[{i}]"
        try:
            key = (int(b["fromRe"]), int(b["sectorDeg"]))
        except (KeyError, TypeError, ValueError):
            report.add(bwhere, "starlight-bins", "no numeric fromRe/sectorDeg")
            continue
        name = f"{key[0]}-{key[0] + 1} Re, {key[1]}-{key[1] + 45} deg"
        if key in file_bins:
            report.add(f"{bwhere} ({name})", "starlight-bins", "the bin is listed twice")
        file_bins[key] = (i, b, name)

    def compare(assignment):
        """Violations of the file's bins for one choice of bin per edge case."""
        found, derived = [], {}
        for sp, key in assignment:
            if key is not None:
                derived.setdefault(key, []).append(sp)
        for key, sps in sorted(derived.items()):
            if key not in file_bins:
                found.append((f"{where0} ({key[0]}-{key[0] + 1} Re, {key[1]}-{key[1] + 45} deg)",
                              f"missing: {len(sps)} spectra hold galaxy light there, e.g. {sps[0]['where']}"))
        for key, (i, b, name) in sorted(file_bins.items()):
            bwhere = f"{where0}.bins[{i}] ({name})"
            sps = derived.get(key)
            if not sps:
                found.append((bwhere, "no starlight slit or tracer sky part of slits.csv lies in this bin"))
                continue
            for field, kind, words in (("starlightSlits", "starlight", "starlight slits"), ("tracerSkyParts", "tracer", "tracer sky parts")):
                n = sum(1 for x in sps if x["kind"] == kind)
                if b.get(field) != n:
                    found.append((bwhere, f"{field} {json.dumps(b.get(field))}, but slits.csv gives {n} {words} there"))
            sn = coadd([x["part"] for x in sps], f)
            if not sky_unknown:
                for field, j in (("snPerA", 0), ("snPerAWithoutFloor", 1)):
                    if not within(b.get(field), sn[j], sn[j]):
                        found.append((bwhere, f"{field} {json.dumps(b.get(field))}, but the spectra of slits.csv in this bin co-add to {sn[j]:.2f}"))
            reach = max(x["r"] for x in sps)
            if not within(b.get("reachRe"), reach, reach, rel=0, abs_tol=REACH_ABS_TOL_RE):
                found.append((bwhere, f"reachRe {json.dumps(b.get('reachRe'))}, but its spectra reach {reach:.4f} Re"))
        return found

    # Every spectrum in its own bin, except the few near an edge: the choice of their bins that explains the file best.
    edge, layouts = [], 1
    for sp in spectra:
        if len(sp["cands"]) > 1 and layouts * len(sp["cands"]) <= MAX_EDGE_LAYOUTS:
            edge.append(sp)
            layouts *= len(sp["cands"])
    fixed = [(sp, sp["cands"][0]) for sp in spectra if not any(sp is e for e in edge)]
    best = None
    for choice in itertools.product(*[sp["cands"] for sp in edge]):
        found = compare(fixed + list(zip(edge, choice)))
        if best is None or len(found) < len(best):
            best = found
        if not best:
            break
    for where, what in best or []:
        report.add(where, "starlight-bins", what)

    achieved_met, inside, short = 0, 0, []
    for key, (i, b, name) in sorted(file_bins.items()):
        bwhere = f"{where0}.bins[{i}] ({name})"
        if first_model is not None and not sky_unknown:
            if key[0] <= 0 or f <= 0:
                cap = None
            else:
                mu = gal["muE"] + 2.5 * bn / math.log(10) * (key[0] ** (1.0 / gal["sersicN"]) - 1) + first_model["toAb"]
                cap = 10 ** (-0.4 * (mu - first_model["sky"])) / f
            got = b.get("floorCapSnPerA")
            if (cap is None) != (got is None) or (cap is not None and not within(got, cap, cap, rel=1e-6)):
                report.add(bwhere, "starlight-bins", f"floorCapSnPerA {json.dumps(got)}, but the sky floor caps the bin at "
                           + ("nothing (central bin or no floor)" if cap is None else f"{cap:.2f}"))
        sn = b.get("snPerA")
        met = b.get("met")
        if not isinstance(met, bool) or not isinstance(sn, (int, float)) or met != (sn >= target) and abs(sn - target) > 0.005:
            report.add(bwhere, "starlight-bins", f"met {json.dumps(met)}, but its S/N {json.dumps(sn)} is "
                       f"{'at or above' if isinstance(sn, (int, float)) and sn >= target else 'below'} the target {target:g}")
        if b.get("targetSnPerA") != target:
            report.add(bwhere, "starlight-bins", f"targetSnPerA {json.dumps(b.get('targetSnPerA'))}, but solved.plan.json gives {target}")
        if key[0] < goal:
            inside += 1
            if met is True:
                achieved_met += 1
            else:
                short.append((name, b))
    # The goal entry: bins inside the goal radius and those reaching the target, each short one named with its cause.
    ge = next((x for x in cov.get("goals", []) if isinstance(x, dict) and x.get("name") == "starlightBins"), None)
    gwhere = "coverage.json goals (starlightBins)"
    if ge is None:
        report.add(gwhere, "starlight-bins", "missing: the goal of co-added starlight per bin")
    else:
        if ge.get("target") != inside or ge.get("achieved") != achieved_met:
            report.add(gwhere, "starlight-bins", f"target {json.dumps(ge.get('target'))} / achieved {json.dumps(ge.get('achieved'))}, but the bins inside "
                       f"{goal} Re number {inside}, of which {achieved_met} reach the target")
        if ge.get("met") != (inside > 0 and achieved_met >= inside):
            report.add(gwhere, "starlight-bins", f"met {json.dumps(ge.get('met'))} with {achieved_met} of {inside} bins reaching the target")
        reason = ge.get("reason") if isinstance(ge.get("reason"), str) else ""
        for name, b in short:
            cap = b.get("floorCapSnPerA")
            cause = "floor" if isinstance(cap, (int, float)) and cap < target else "free slit space"
            label = name.replace(",", "")
            if label not in reason or cause not in reason:
                report.add(gwhere, "starlight-bins", f"the short bin {name} is not named with its cause ({cause}) in the reason")
    note = f"{len(file_bins)} starlight bins re-derived"
    if sky_unknown:
        note += " (S/N not re-derived: the Moon of observing.date could not be computed)"
    return note


# ---- the catalog (an extra cross-check: a target's slit is centred on it) ---------------------------------------

def check_catalog(plan, out_dir, slit_rows, report_rows, report):
    """Tracer and alignment rows sit on their catalog object (the contract: "a target's minimal slit is centred on
    it", and ra_deg/dec_deg is the point (x, y)), and no object comes from a row catalog-report.csv lists as unused.
    Done for CSV catalogs whose id/ra/dec columns are named literally or in the plan's catalogColumns; returns a
    note for the summary (what was checked, or why it was not)."""
    if not isinstance(plan, dict) or not isinstance(plan.get("catalog"), str):
        return "catalog not cross-checked (no catalog path in solved.plan.json)"
    path = plan["catalog"] if os.path.isabs(plan["catalog"]) else os.path.join(out_dir, plan["catalog"])
    mapping = plan.get("catalogColumns") if isinstance(plan.get("catalogColumns"), dict) else {}
    cols = {k: mapping.get(k, k) for k in ("id", "ra", "dec")}
    if not os.path.isfile(path):
        report.add("solved.plan.json catalog", "plan", f"the catalog path does not resolve from {out_dir}: {path}")
        return "catalog not found"
    with open(path, newline="", encoding="utf-8", errors="replace") as f:
        head = f.read(4096)
        f.seek(0)
        if head.lstrip().startswith(("#", "<", "SIMPLE")):
            return f"catalog not cross-checked ({os.path.basename(path)} is not a plain CSV)"
        reader = csv.reader(f)
        header = next(reader, [])
        if not all(c in header for c in cols.values()):
            return f"catalog not cross-checked (columns {list(cols.values())} not all in {os.path.basename(path)})"
        ix = {k: header.index(c) for k, c in cols.items()}
        rows_of_id = {}   # id -> [(line, ra_deg, dec_deg)], every readable row (an id may repeat)
        for cells in reader:
            if len(cells) <= max(ix.values()):
                continue
            try:
                text = cells[ix["ra"]].strip()
                ra = float(text) * (15.0 if mapping.get("raUnit") == "hour" else 1.0) \
                    if _PLAIN_NUMBER.match(text) else ra_deg_of(text)
                rows_of_id.setdefault(cells[ix["id"]].strip(), []).append((reader.line_num, ra, dec_deg_of(cells[ix["dec"]])))
            except (ValueError, TypeError):
                continue
    rejected = {int(r["line"]) for _, r in report_rows if re.fullmatch(r"[1-9]\d*", (r.get("line") or "").strip())}
    targets = [r for r in slit_rows if r["role"] in ("tracer", "alignment") and r["object"] != ""]
    pairs = []        # (target, catalog row) for every used (not rejected) catalog row of the target's id
    for r in targets:
        cands = rows_of_id.get(r["object"], [])
        used = [c for c in cands if c[0] not in rejected]
        if not cands:
            report.add(r["where"], "catalog", f"object {r['object']} is not a readable row of {os.path.basename(path)}")
        elif not used:
            report.add(r["where"], "catalog", f"object {r['object']} is only on catalog line(s) "
                       f"{', '.join(str(c[0]) for c in cands)}, which catalog-report.csv lists as not used")
        pairs.extend((r, c) for c in used)
    known = {}
    if pairs:
        slit_pos = SkyCoord([r["ra"] for r, _ in pairs] * u.deg, [r["dec"] for r, _ in pairs] * u.deg)
        cat_pos = SkyCoord([c[1] for _, c in pairs] * u.deg, [c[2] for _, c in pairs] * u.deg)
        for (r, _), d in zip(pairs, slit_pos.separation(cat_pos).to_value(u.arcsec)):
            known[r["line"]] = min(known.get(r["line"], math.inf), float(d))
        for r in targets:
            d = known.get(r["line"])
            if d is not None and not d <= POSITION_TOL_ARCSEC:
                report.add(r["where"], "catalog", f"the row is {d:.4g} arcsec from its object {r['object']} in the catalog")
    return f"{len(known)} targets matched to {os.path.basename(path)}"


# ---- the whole folder --------------------------------------------------------------------------------------------

def check_folder(out_dir, profile_dir):
    """Every violation of the contract in an output folder, plus summary figures."""
    report = Report()
    stats = {"rows": 0, "masks": 0, "worst": 0.0, "worst_where": "-", "catalog": "-", "starlight": ""}

    _, mask_rows = read_csv(os.path.join(out_dir, "masks.csv"), "masks.csv", MASKS_COLUMNS, report)
    _, slit_rows_raw = read_csv(os.path.join(out_dir, "slits.csv"), "slits.csv", SLITS_COLUMNS, report)
    _, report_rows = read_csv(os.path.join(out_dir, "catalog-report.csv"), "catalog-report.csv", REPORT_COLUMNS, report)
    plan = read_json(os.path.join(out_dir, "solved.plan.json"), "solved.plan.json", report)
    cov = read_json(os.path.join(out_dir, "coverage.json"), "coverage.json", report)

    # catalog-report.csv: line is a 1-based line/row number
    for line, r in report_rows:
        text = (r.get("line") or "").strip()
        if not re.fullmatch(r"[1-9]\d*", text):
            report.add(f"catalog-report.csv line {line}", "catalog-report", f"line {text!r} is not a 1-based line number")
        if (r.get("reason") or "").strip() == "":
            report.add(f"catalog-report.csv line {line}", "catalog-report", "empty reason")

    # the plan: format, galaxy, goals
    galaxy, goals, lines_rest, vsys = None, {}, [], None
    if isinstance(plan, dict):
        if plan.get("format") != PLAN_FORMAT:
            report.add("solved.plan.json", "plan", f"format is {plan.get('format')!r}, not {PLAN_FORMAT!r}")
        goals = plan.get("goals") if isinstance(plan.get("goals"), dict) else {}
        lines_rest = goals.get("linesA") if isinstance(goals.get("linesA"), list) else []
        if not lines_rest or not all(isinstance(L, (int, float)) for L in lines_rest):
            report.add("solved.plan.json goals.linesA", "plan", "no list of rest wavelengths (Angstrom)")
            lines_rest = [L for L in lines_rest if isinstance(L, (int, float))]
        g = plan.get("galaxy") if isinstance(plan.get("galaxy"), dict) else {}
        try:
            galaxy = {"raDeg": ra_deg_of(g.get("ra", g.get("raDeg"))), "decDeg": dec_deg_of(g.get("dec", g.get("decDeg"))),
                      "paDeg": float(g["paDeg"]), "axisRatio": float(g["axisRatio"]), "reArcsec": float(g["reArcsec"])}
            vsys = float(g["vsysKms"])
            if not (galaxy["reArcsec"] > 0 and 0 < galaxy["axisRatio"] <= 1):
                report.add("solved.plan.json galaxy", "plan", "reArcsec must be > 0 and axisRatio in (0, 1]")
                galaxy = None
        except (KeyError, TypeError, ValueError) as e:
            report.add("solved.plan.json galaxy", "plan", f"cannot read galaxy ra/dec/paDeg/axisRatio/reArcsec/vsysKms: {e}")
            galaxy = None
        if galaxy:
            cross_check_centre(galaxy["raDeg"], galaxy["decDeg"], "solved.plan.json galaxy", report)

    # profiles
    profiles = load_profiles(profile_dir)
    plan_instrument = plan.get("instrument") if isinstance(plan, dict) else None
    # Revision 2: several spectrographs, "instruments": [{"profile": id or path, "masks": n}, ...].
    plan_instruments = plan.get("instruments") if isinstance(plan, dict) else None
    if plan_instruments is not None and not (isinstance(plan_instruments, list) and all(isinstance(i, dict) and isinstance(i.get("profile"), str) for i in plan_instruments)):
        report.add("solved.plan.json instruments", "plan", "instruments must be a list of {profile, masks}")
        plan_instruments = None
    plan_refs = ([plan_instrument] if isinstance(plan_instrument, str) else []) + [i["profile"] for i in plan_instruments or []]
    path_refs = [r for r in plan_refs if looks_like_path(r)]

    def profile_file(ref):
        path = ref if os.path.isabs(ref) else os.path.join(out_dir, ref)
        try:
            with open(path, encoding="utf-8") as f:
                p = json.load(f)
            return p if isinstance(p, dict) else None
        except (OSError, ValueError):
            return None

    def profile_for(instrument):
        # A profile file the plan names comes first (it may reuse the id of a shipped profile), then the profile folder.
        for ref in path_refs:
            p = profile_file(ref)
            if p is not None and p.get("id") == instrument:
                return p
        if instrument in profiles:
            return profiles[instrument][0]
        return None

    def ref_id(ref):
        if looks_like_path(ref):
            p = profile_file(ref)
            return p.get("id") if p is not None else None
        return ref

    # masks.csv
    masks = {}
    for line, r in mask_rows:
        where = f"masks.csv line {line} (mask {r.get('mask_id')})"
        mid = r.get("mask_id", "")
        if mid == "":
            report.add(where, "masks", "empty mask_id")
            continue
        if mid in masks:
            report.add(where, "masks", f"mask_id {mid} repeats masks.csv line {masks[mid]['line']}")
            continue
        ra, dec, pa = (number(r, c, where, report) for c in ("ra_deg", "dec_deg", "pa_deg"))
        if None in (ra, dec, pa):
            continue
        if not (0 <= ra < 360 and -90 <= dec <= 90):
            report.add(where, "masks", f"ra_deg {ra} / dec_deg {dec} out of [0, 360) / [-90, 90]")
        if not 0 <= pa < 360:
            report.add(where, "masks", f"pa_deg {pa} is not in [0, 360)")
        prof = profile_for(r.get("instrument", ""))
        if prof is None:
            report.add(where, "profile", f"no instrument profile with id {r.get('instrument')!r} in {profile_dir}"
                       + (f" nor at {', '.join(path_refs)} (relative to {out_dir})" if path_refs else ""))
            continue
        cross_check_centre(ra, dec, where, report)
        masks[mid] = {"line": line, "ra": ra, "dec": dec, "pa": pa, "profile": prof, "wcs": tan_wcs(ra, dec)}
    stats["masks"] = len(masks)

    # Several spectrographs: every mask's instrument is one of the plan's, each takes exactly its number of masks,
    # and a solved.plan.json mask naming its instrument names the one masks.csv gives.
    if plan_instruments:
        ids = {}
        for i in plan_instruments:
            pid = ref_id(i["profile"])
            if pid is None:
                report.add("solved.plan.json instruments", "instruments", f"profile {i['profile']!r} cannot be read (relative to {out_dir})")
                continue
            ids[pid] = ids.get(pid, 0) + (i.get("masks") if isinstance(i.get("masks"), int) else 0)
        counts = {}
        for line, r in mask_rows:
            inst = r.get("instrument", "")
            counts[inst] = counts.get(inst, 0) + 1
            if inst not in ids:
                report.add(f"masks.csv line {line} (mask {r.get('mask_id')})", "instruments", f"instrument {inst!r} is not among the plan's instruments {sorted(ids)}")
        for pid, n in ids.items():
            if counts.get(pid, 0) != n:
                report.add("masks.csv", "instruments", f"{counts.get(pid, 0)} masks use {pid!r}, the plan's instruments give it {n}")
        rows_by_id = {r.get("mask_id"): r for _, r in mask_rows}
        for k, pm in enumerate(plan.get("masks") or []):
            if not isinstance(pm, dict) or not isinstance(pm.get("instrument"), str):
                continue
            row = rows_by_id.get(pm.get("id"))
            named = pm["instrument"]
            if row is not None and row.get("instrument") not in (named, ref_id(named)):
                report.add(f"solved.plan.json masks[{k}] (id {pm.get('id')})", "instruments", f"instrument {named!r}, but masks.csv gives {row.get('instrument')!r}")

    # solved.plan.json masks equal masks.csv
    if isinstance(plan, dict):
        pm = plan.get("masks")
        if not isinstance(pm, list):
            report.add("solved.plan.json", "plan", "no masks list")
        else:
            seen = set()
            for i, m in enumerate(pm):
                where = f"solved.plan.json masks[{i}]"
                if not isinstance(m, dict):
                    report.add(where, "plan", "not an object")
                    continue
                mid = m.get("id")
                seen.add(mid)
                vals = [m.get(k) for k in ("raDeg", "decDeg", "paDeg")]
                if not all(isinstance(v, (int, float)) and math.isfinite(v) for v in vals):
                    report.add(f"{where} (mask {mid})", "plan", f"not placed: raDeg/decDeg/paDeg are {vals}")
                    continue
                mc = masks.get(mid)
                if mc is None:
                    if not any(r.get("mask_id") == mid for _, r in mask_rows):
                        report.add(f"{where} (mask {mid})", "plan", "mask is missing from masks.csv")
                    continue
                dra = (vals[0] - mc["ra"] + 180.0) % 360.0 - 180.0
                dpa = (vals[2] - mc["pa"] + 180.0) % 360.0 - 180.0
                if abs(dra) > ANGLE_TOL_DEG or abs(vals[1] - mc["dec"]) > ANGLE_TOL_DEG or abs(dpa) > ANGLE_TOL_DEG:
                    report.add(f"{where} (mask {mid})", "plan",
                               f"raDeg/decDeg/paDeg {vals} differ from masks.csv line {mc['line']} "
                               f"({mc['ra']}, {mc['dec']}, {mc['pa']})")
            for mid, mc in masks.items():
                if mid not in seen:
                    report.add(f"masks.csv line {mc['line']} (mask {mid})", "plan", "mask is missing from solved.plan.json")

    # slits.csv, row by row
    dv_kms = goals.get("velocityHalfRangeKms", 500)
    half_window_a = goals.get("lineHalfWindowA", 10)
    if not isinstance(dv_kms, (int, float)) or not isinstance(half_window_a, (int, float)) or dv_kms < 0 or half_window_a < 0:
        report.add("solved.plan.json goals", "plan", "velocityHalfRangeKms and lineHalfWindowA must be numbers >= 0")
        dv_kms, half_window_a = 500, 10
    lines_obs = line_windows_a(lines_rest, vsys or 0.0, dv_kms, half_window_a)
    slit_rows = []
    per_mask = {}
    for line, r in slit_rows_raw:
        stats["rows"] += 1
        mid, sid, oid, role = (r.get(c, "") for c in ("mask_id", "slit_id", "object_id", "role"))
        where = f"slits.csv line {line} (mask {mid}, slit {sid}, object {oid or '-'})"
        if role not in ROLES:
            report.add(where, "role", f"role {role!r} is not one of {', '.join(ROLES)}")
        vals = {c: number(r, c, where, report) for c in
                ("ra_deg", "dec_deg", "x_arcsec", "y_arcsec", "len_below_arcsec", "len_above_arcsec", "width_arcsec", "tilt_deg")}
        number(r, "priority", where, report, allow_empty=True)
        mag = number(r, "mag", where, report, allow_empty=True)
        if vals["ra_deg"] is not None and vals["dec_deg"] is not None:
            # coverage and the catalog cross-check need only the sky position
            slit_rows.append({"line": line, "where": where, "mask": mid, "object": oid, "role": role,
                              "ra": vals["ra_deg"], "dec": vals["dec_deg"]})
        mask = masks.get(mid)
        if mask is None:
            if not any(mr.get("mask_id") == mid for _, mr in mask_rows):
                report.add(where, "mask", f"mask_id {mid!r} is not in masks.csv")
            continue
        if None in vals.values():
            continue
        rec = {"line": line, "where": where, "mask": mid, "slit": sid, "object": oid, "role": role,
               "ra": vals["ra_deg"], "dec": vals["dec_deg"], "x": vals["x_arcsec"], "y": vals["y_arcsec"],
               "below": vals["len_below_arcsec"], "above": vals["len_above_arcsec"], "width": vals["width_arcsec"],
               "tilt": vals["tilt_deg"], "mag": mag}
        per_mask.setdefault(mid, []).append(rec)

    for mid, rows in per_mask.items():
        mask = masks[mid]
        prof = mask["profile"]
        sl, al, det = prof["slits"], prof["alignment"], prof["detector"]
        poly = [(float(px), float(py)) for px, py in prof["footprint"]]
        # positions: project every row's (ra, dec) about the mask centre, rotate into the mask frame
        xi, eta = sky_to_tangent_arcsec(mask["wcs"], [r["ra"] for r in rows], [r["dec"] for r in rows])
        pa = math.radians(mask["pa"])
        ys = xi * math.sin(pa) + eta * math.cos(pa)
        xs = xi * math.cos(pa) - eta * math.sin(pa)
        spans = []
        for r, xp, yp in zip(rows, xs, ys):
            where = r["where"]
            res = math.hypot(xp - r["x"], yp - r["y"]) if math.isfinite(xp) and math.isfinite(yp) else math.inf
            if res > stats["worst"] or stats["worst_where"] == "-":
                stats["worst"], stats["worst_where"] = max(res, stats["worst"]), where
            if not res <= POSITION_TOL_ARCSEC:
                report.add(where, "position",
                           f"ra_deg/dec_deg project to mask (x, y) = ({xp:.5f}, {yp:.5f}) arcsec, the row says "
                           f"({r['x']}, {r['y']}): {res:.4g} arcsec apart (tolerance {POSITION_TOL_ARCSEC})")
            # lengths and widths
            if r["width"] <= 0:
                report.add(where, "length", f"width_arcsec {r['width']} must be positive")
            if r["role"] == "alignment":
                half = al["boxSizeArcsec"] / 2.0
                if abs(r["below"] - half) > LENGTH_TOL_ARCSEC or abs(r["above"] - half) > LENGTH_TOL_ARCSEC \
                        or abs(r["width"] - al["boxSizeArcsec"]) > LENGTH_TOL_ARCSEC:
                    report.add(where, "box-size",
                               f"alignment box len_below/len_above/width {r['below']}/{r['above']}/{r['width']}, "
                               f"must be {half}/{half}/{al['boxSizeArcsec']} (alignment.boxSizeArcsec)")
                bright, faint = al["magRange"]
                if r["mag"] is None or not (bright - 1e-9 <= r["mag"] <= faint + 1e-9):
                    report.add(where, "alignment-mag", f"mag {r['mag']} outside alignment.magRange [{bright}, {faint}]")
            elif r["role"] in SLIT_ROLES:
                half = sl["minLengthArcsec"] / 2.0
                if r["below"] < half - LENGTH_TOL_ARCSEC or r["above"] < half - LENGTH_TOL_ARCSEC:
                    report.add(where, "min-length",
                               f"len_below {r['below']} / len_above {r['above']} arcsec; each must be >= "
                               f"minLengthArcsec/2 = {half}")
            if abs(r["tilt"]) > sl["maxTiltDeg"] + 1e-9:
                report.add(where, "tilt", f"tilt_deg {r['tilt']} exceeds slits.maxTiltDeg {sl['maxTiltDeg']}")
            corners = row_corners(r["x"], r["y"], r["below"], r["above"], r["width"], r["tilt"])
            why = quad_in_polygon(corners, poly)
            if why:
                report.add(where, "footprint", why)
            # wavelength rule at the slit's x (its centre)
            if r["role"] in SCIENCE_ROLES:
                why = wavelength_problem(r["x"], lines_obs, det)
                if why:
                    report.add(where, "wavelength", f"at x = {r['x']:.4f} arcsec: {why}")
            # y-span (the tilted rectangle's y extent; equal to y - len_below .. y + len_above at zero tilt)
            cy = [c[1] for c in corners]
            spans.append((min(cy), max(cy), r))
        # the gap rule: every pair of rows of this mask (sorted by lower end, each row against every row below it)
        gap = sl["gapArcsec"]
        spans.sort(key=lambda s: s[0])
        for j, (lo_j, hi_j, rj) in enumerate(spans):
            for k in range(j - 1, -1, -1):
                lo_k, hi_k, rk = spans[k]
                clear = lo_j - hi_k
                if clear < gap - LENGTH_TOL_ARCSEC:
                    how = f"is {clear:.4f} arcsec from" if clear >= 0 else f"overlaps by {-clear:.4f} arcsec"
                    report.add(rj["where"], "gap",
                               f"y-span [{lo_j:.4f}, {hi_j:.4f}] {how} slit {rk['slit']} "
                               f"(line {rk['line']}, y-span [{lo_k:.4f}, {hi_k:.4f}]); slits.gapArcsec is {gap}")
        # alignment boxes per mask
        n_align = sum(1 for r in rows if r["role"] == "alignment")
        if n_align < al["minCount"]:
            report.add(f"masks.csv line {mask['line']} (mask {mid})", "alignment-count",
                       f"{n_align} alignment boxes, alignment.minCount is {al['minCount']}")
    for mid, mask in masks.items():
        if mid not in per_mask and mask["profile"]["alignment"]["minCount"] > 0:
            report.add(f"masks.csv line {mask['line']} (mask {mid})", "alignment-count",
                       f"0 alignment boxes, alignment.minCount is {mask['profile']['alignment']['minCount']}")

    # each object at most once over all masks (rows with an empty object_id name no object), in file order;
    # revision 2: an alignment star may serve several masks (each mask is its own exposure), once per mask, and
    # an object used as an alignment star is not also a tracer, starlight or sky row
    seen_objects = {}
    seen_alignment = {}
    seen_other = {}
    for r in sorted(slit_rows, key=lambda z: z["line"]):
        if r["object"] != "":
            is_align = r["role"] == "alignment"
            key = (r["mask"], r["object"]) if is_align else r["object"]
            first = seen_objects.get(key) or (seen_other.get(r["object"]) if is_align else seen_alignment.get(r["object"]))
            if first is not None:
                report.add(r["where"], "duplicate-object", f"object {r['object']} also on {first['where']}")
            else:
                seen_objects[key] = r
                (seen_alignment if is_align else seen_other).setdefault(r["object"], r)
        elif r["role"] in ("tracer", "alignment"):
            report.add(r["where"], "object", f"a {r['role']} row must name its catalog object")

    stats["catalog"] = check_catalog(plan, out_dir, slit_rows, report_rows, report)
    if galaxy is not None and cov is not None:
        check_coverage(cov, galaxy, goals, slit_rows, report)
    if galaxy is not None and isinstance(cov, dict) and isinstance(plan, dict):
        stats["starlight"] = check_starlight_bins(cov, plan, masks, per_mask, report)
    return report, stats


# ---- self test of the geometry (run by test/contract/contract.test.ts) -------------------------------------------

def self_test():
    """Known answers for the hand-written geometry; returns a list of failures."""
    fails = []

    def expect(cond, what):
        if not cond:
            fails.append(what)

    # non-convex footprint: a square 0..10 with a notch x 4..6, y 6..10 cut from the top
    poly = [(0, 0), (10, 0), (10, 10), (6, 10), (6, 6), (4, 6), (4, 10), (0, 10)]
    expect(point_in_polygon((5, 5), poly), "centre below the notch is inside")
    expect(not point_in_polygon((5, 8), poly), "point in the notch is outside")
    expect(point_in_polygon((6, 8), poly), "point on the notch wall is inside (boundary)")
    expect(point_in_polygon((10, 3), poly), "point on the outer edge is inside (boundary)")
    expect(not point_in_polygon((10.001, 3), poly), "point just outside is outside")
    expect(quad_in_polygon([(1, 1), (3, 1), (3, 9), (1, 9)], poly) is None, "rect left of the notch is inside")
    # a rect whose corners are all inside but which straddles the notch: caught by the edge test
    why = quad_in_polygon([(3, 7), (7, 7), (7, 9), (3, 9)], poly)
    expect(why is not None and "crosses" in why, f"rect straddling the notch is reported as crossing ({why})")
    # corners inside, edges leaving through the notch's vertices exactly (touch points): midpoints catch it
    why = quad_in_polygon([(4, 6), (6, 6), (6, 6.0000001), (4, 6.0000001)], poly)
    expect(why is None, f"a thin box lying on the notch floor touches the boundary only ({why})")
    why = quad_in_polygon([(2, 8), (8, 8), (8, 8.5), (2, 8.5)], poly)
    expect(why is not None, "rect spanning the notch at mid-height is outside")
    cw = list(reversed(poly))   # the same footprint listed clockwise: every answer must be the same
    expect(not point_in_polygon((5, 8), cw) and point_in_polygon((5, 5), cw), "clockwise polygon, points")
    expect(quad_in_polygon([(3, 7), (7, 7), (7, 9), (3, 9)], cw) is not None
           and quad_in_polygon([(1, 1), (3, 1), (3, 9), (1, 9)], cw) is None, "clockwise polygon, rectangles")
    expect(fold_azimuth_deg(200.0, 360.0) == 200.0 and fold_azimuth_deg(200.0, 180.0) == 20.0
           and fold_azimuth_deg(100.0, 90.0) == 80.0 and fold_azimuth_deg(350.0, 90.0) == 10.0, "azimuth folding")
    expect(segments_cross_properly((0, 0), (2, 2), (0, 2), (2, 0)), "an X crosses")
    expect(not segments_cross_properly((0, 0), (2, 0), (1, 0), (1, 2)), "a T touching is no crossing")
    # tilt convention: +y turns towards +x; a slit of length 2 above its centre, tilted 90 deg, points along +x
    c = row_corners(0, 0, 0, 2, 0, 90)
    expect(abs(c[2][0] - 2) < 1e-12 and abs(c[2][1]) < 1e-12, f"tilt 90 turns +y to +x ({c[2]})")
    c = row_corners(1, 1, 1, 1, 2, 0)
    expect(c == [(0, 0), (2, 0), (2, 2), (0, 2)], f"untilted corners ({c})")
    # wavelength rule (contract formula) on a toy detector
    det = {"pixels": 1000, "xArcsecPerPixel": 0.5, "centralWavelengthA": 8000, "dispersionAPerPixel": 1.0,
           "gapsPixels": [[600, 610]], "edgeMarginPixels": 10}
    expect(detector_pixel(10, 8050, det) == 500 + 20 + 50, "pixel formula")
    bare = lambda L: line_windows_a([L], 0.0, 0.0, 0.0)
    expect(wavelength_problem(0, bare(8080.0), det) is None, "line at pixel 580 is 20 px from the gap: fine")
    expect(wavelength_problem(0, bare(8095.0), det) is not None, "line at pixel 595 is within 10 px of the gap")
    expect(wavelength_problem(0, bare(7510.0), det) is None, "line at pixel 10 (= margin) is fine")
    expect(wavelength_problem(0, bare(7509.0), det) is not None, "line at pixel 9 is inside the edge margin")
    # windows: 8000 A at +-500 km/s is 7986.66-8013.34 A, +-10 A gives 7976.66-8023.34 A (pixels 476.7-523.3)
    win = line_windows_a([8000.0], 0.0, 500.0, 10.0)
    expect(abs(win[0][1] - (8000 * (1 - 500 / 299792.458) - 10)) < 1e-9, "window low end")
    expect(wavelength_problem(0, win, det) is None, "a window in mid-detector is fine")
    # at x = 100 arcsec (+200 px) the window spans 676.7-723.3: clear of the gap band (590, 620)
    expect(wavelength_problem(100, win, det) is None, "window beyond the gap is fine")
    # at x = 60 arcsec (+120 px) it spans 596.7-643.3: its low part is in the gap band though the line centre (620) is not
    expect(wavelength_problem(60, bare(8000.0), det) is None and wavelength_problem(60, win, det) is not None,
           "the window catches a line whose velocity range reaches the gap")
    # projection: East is +xi, North is +eta, across RA 0/360 and near a pole
    for ra0, dec0 in ((359.999, 0.0), (0.0005, -80.0), (180.0, 80.0)):
        w = tan_wcs(ra0, dec0)
        east = SkyCoord(ra0 * u.deg, dec0 * u.deg).directional_offset_by(90 * u.deg, 10 * u.arcsec)
        xi, eta = sky_to_tangent_arcsec(w, [east.ra.deg], [east.dec.deg])
        expect(abs(xi[0] - 10) < 1e-6 and abs(eta[0]) < 1e-6, f"East offset projects to +xi at ({ra0}, {dec0}): {xi[0]}, {eta[0]}")
        rep = Report()
        cross_check_centre(ra0, dec0, "self-test", rep)
        expect(not rep.lines, f"cross-check at ({ra0}, {dec0}): {rep.lines}")
    # mask frame at PA 90: y points East, x points South
    w = tan_wcs(10.0, 20.0)
    north = SkyCoord(10 * u.deg, 20 * u.deg).directional_offset_by(0 * u.deg, 5 * u.arcsec)
    xi, eta = sky_to_tangent_arcsec(w, [north.ra.deg], [north.dec.deg])
    pa = math.radians(90)
    x = xi[0] * math.cos(pa) - eta[0] * math.sin(pa)
    expect(abs(x + 5) < 1e-6, f"at PA 90 a point 5 arcsec North has x = -5 ({x})")
    expect(abs(ra_deg_of("12:30:00") - 187.5) < 1e-9 and ra_deg_of("187.5") == 187.5
           and abs(dec_deg_of("-05 30 00") + 5.5) < 1e-12 and abs(dec_deg_of("-00 30") + 0.5) < 1e-12, "sexagesimal RA/Dec")
    # Sersic b_n: Graham & Driver (2005, PASA 22, 118) list b_1 = 1.678 and b_4 = 7.669; the Ciotti & Bertin (1999,
    # A&A 352, 447) series 2n - 1/3 + 4/(405n) + 46/(25515n^2) agrees to ~1e-6 at n = 4 (a second route)
    expect(abs(sersic_bn(1) - 1.678) < 5e-4 and abs(sersic_bn(4) - 7.669) < 5e-4, f"b_n ({sersic_bn(1)}, {sersic_bn(4)})")
    expect(abs(sersic_bn(4) - (8 - 1 / 3 + 4 / 1620 + 46 / (25515 * 16))) < 1e-5, "b_4 against the Ciotti & Bertin series")
    # Howell's CCD equation, worked numbers of the project's references (computed from the formula): 61.28 without a
    # sky estimate, 56.69 with n_B = 1000
    expect(abs(howell_sn(24000, 200, 620, 1.833, 5) - 61.28) < 0.005, "Howell S/N, n_B infinite")
    expect(abs(howell_sn(24000, 200, 620, 1.833, 5, 1000) - 56.69) < 0.005, "Howell S/N, n_B = 1000")
    # AB = 0 at 8500 A: 644.69 photons s^-1 cm^-2 A^-1 (derived from f_nu / (h lambda), 3631 Jy)
    expect(abs(photons_per_s_cm2_a(0.0, 8500.0) - 644.69) < 0.01, f"AB photon flux ({photons_per_s_cm2_a(0.0, 8500.0)})")
    # moonlit sky, the references' worked case (derived from K&S 1991): Z = 20, Z_moon = 70, rho = 50, alpha = 45,
    # k = 0.15 -> B_moon = 389.5 nL, V = 19.855 mag/arcsec^2
    b = moon_sky_nanolambert(45.0, 50.0, 70.0, 20.0, 0.15)
    expect(abs(b - 389.5) < 0.1 and abs((20.7233 - math.log(b / 34.08)) / 0.92104 - 19.855) < 1e-3, f"moonlit sky ({b} nL)")
    # co-adding: two equal spectra raise the S/N by sqrt(2) without a floor; a floor f caps it at N / (f N_sky)
    one = (100.0, 400.0, 1000.0)
    sn1, _ = coadd([one], 0.0)
    sn2, _ = coadd([one, one], 0.0)
    expect(abs(sn2 / sn1 - math.sqrt(2)) < 1e-12, "co-adding two equal spectra")
    expect(abs(coadd([one] * 10 ** 6, 0.01)[0] - 100.0 / (0.01 * 1000.0)) < 1e-2, "the sky floor caps co-adding")
    return fails


def main(argv):
    ap = argparse.ArgumentParser(description="Check a haloweave plan output folder against the contract (astropy).")
    ap.add_argument("dirs", nargs="*", metavar="DIR",
                    help="output folder(s) of `haloweave plan PLAN --out DIR`; with several, each line starts with 'DIR: '")
    ap.add_argument("--profile-dir", default=os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "instrument-profiles"),
                    help="folder of instrument profiles (*.json, matched by their `id` key)")
    ap.add_argument("--self-test", action="store_true", help="run the checker's own geometry tests")
    args = ap.parse_args(argv)
    if args.self_test:
        fails = self_test()
        for f in fails:
            print(f"self-test failed: {f}")
        if not fails:
            print(f"contract_check self-test: ok (astropy {astropy.__version__}, numpy {np.__version__})")
        return 1 if fails else 0
    if not args.dirs:
        ap.error("DIR is required")
    many = len(args.dirs) > 1
    status = 0
    for out_dir in args.dirs:
        prefix = f"{out_dir}: " if many else ""
        report, stats = check_folder(out_dir, os.path.normpath(args.profile_dir))
        for line in report.lines:
            print(prefix + line)
        if report.lines:
            print(f"contract_check: {len(report.lines)} violation(s) in {out_dir}", file=sys.stderr)
            status = 1
        else:
            print(f"{prefix}contract_check: ok: {stats['masks']} masks, {stats['rows']} rows checked, worst position "
                  f"residual {stats['worst']:.3g} arcsec ({stats['worst_where']}); {stats['catalog']}; "
                  f"{stats['starlight'] + '; ' if stats['starlight'] else ''}astropy {astropy.__version__}")
    return status

if __name__ == "__main__":
    sys.exit(main(sys.argv[1:]))
