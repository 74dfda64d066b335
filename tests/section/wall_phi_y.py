#!/usr/bin/env python3
"""Fibre moment-curvature analysis of a rectangular RC wall section with the maintained
section library `concreteproperties` (PyPI; installed by tests/section/setup.sh), used by the
integration test `verification::section` to cross-check the wall yield curvature
approximation phi_y = 2.0*eps_y/lw of Priestley, Calvi & Kowalsky (2007).

Input (stdin): a JSON list of cases {"lw_m", "tw_m", "fc_mpa", "fy_mpa", "nu",
"rho_boundary", "rho_web"}; a case with "analysis": "neutral_axis" gets instead the
neutral-axis depth c at the nominal moment (ACI 318-19 stress block) of a wall with its steel
rho_web distributed uniformly, for the c estimate of the boundary-element check (method
section 10). Output (stdout): a JSON list, one object per case, with the
first-yield point (phi_y_first, m_y_first), the nominal moment m_n, the bilinear yield
curvature phi_y = phi_y_first * m_n / m_y_first (1/m, kNm) and what limited each analysis.

Section model (the one the issue names):
- rectangle lw x tw bent in its plane; boundary steel at ratio rho_boundary over 0.1*lw at
  each end, web steel at ratio rho_web over the 0.8*lw between; 4 bar lines per boundary zone
  (the first at 50 mm from the end), web lines at about 250 mm; the two face bars of a line
  are lumped into one bar at mid-thickness (same strain under in-plane bending);
- concrete: modified Mander, unconfined (Mander, Priestley & Park 1988, as implemented by
  concreteproperties.stress_strain_profile.ModifiedMander), eps_co = 0.002, no tension,
  Ec = 4700*sqrt(fc) (ACI 318-19 19.2.2.1(b));
- steel: elastic-perfectly plastic, Es = 200 000 MPa (method.md section 0);
- axial compression N = nu * fc * lw * tw.
Yield curvature (Priestley, Calvi & Kowalsky 2007, section 4.2, from memory):
- first yield: the extreme tension bar reaches eps_y, or the extreme concrete fibre reaches
  0.002, whichever first (phi'_y, M'_y);
- nominal moment M_n: extreme concrete fibre at 0.004 or steel at 0.015, whichever first;
- bilinear idealisation phi_y = phi'_y * M_n / M'_y.
Each limit is imposed as the material's failure strain so that concreteproperties stops its
moment-curvature analysis exactly there (it bisects to the failure curvature).
"""

import json
import warnings
import math
import multiprocessing
import sys

from concreteproperties.concrete_section import ConcreteSection
from concreteproperties.material import Concrete, SteelBar
from concreteproperties.pre import add_bar
from concreteproperties.stress_strain_profile import (
    ModifiedMander,
    RectangularStressBlock,
    SteelElasticPlastic,
)
from sectionproperties.pre.library.primitive_sections import rectangular_section

# the library's interpolation warns on flat parts of the curves; nothing to act on
warnings.filterwarnings("ignore", category=RuntimeWarning)

ES_MPA = 200_000.0
COVER_MM = 50.0
WEB_SPACING_MM = 250.0
BOUNDARY_LINES = 4
# Points of the piecewise-linear concrete curve up to its truncation strain (the library's
# default is 50; each point splits the section at every trial, so it sets the run time;
# 16 points reproduce the parabola-like rise to within about 1 % of stress).
N_POINTS = 16


def dedupe(profile):
    """Drop repeated strain points (the concrete profile lists -0.0 and 0.0 and its
    truncation strain twice; the steel profile lists the yield strain twice when the
    fracture strain is set to it), which make the library's interpolation divide by zero."""
    strains, stresses = [], []
    for e, f in zip(profile.strains, profile.stresses):
        if strains and e <= strains[-1]:
            continue
        strains.append(e)
        stresses.append(f)
    profile.strains = strains
    profile.stresses = stresses


def no_tension(profile):
    """The library interpolates with linear extrapolation outside the listed strains, so
    a concrete curve that starts at 0 would carry tension at its initial slope; a point at
    -1.0 with zero stress keeps the concrete free of tension."""
    dedupe(profile)
    if profile.strains[0] >= 0.0:
        profile.strains = [-1.0, 0.0] + profile.strains[1:]
        profile.stresses = [0.0, 0.0] + profile.stresses[1:]


def materials(fc, fy, eps_c_limit, eps_s_limit):
    ec = 4700.0 * math.sqrt(fc)
    profile = ModifiedMander(
            elastic_modulus=ec,
            compressive_strength=fc,
            tensile_strength=0.0,
            sect_type="rect",
            conc_confined=False,
            conc_tension=False,
            conc_spalling=False,
            eps_co=0.002,
            eps_c_max_unconfined=eps_c_limit,
            n_points=N_POINTS,
    )
    no_tension(profile)
    concrete = Concrete(
        name="concrete",
        density=2.4e-6,
        stress_strain_profile=profile,
        ultimate_stress_strain_profile=RectangularStressBlock(
            compressive_strength=fc, alpha=0.85, gamma=0.85, ultimate_strain=0.003
        ),
        flexural_tensile_strength=0.0,
        colour="lightgrey",
    )
    steel_profile = SteelElasticPlastic(
        yield_strength=fy, elastic_modulus=ES_MPA, fracture_strain=eps_s_limit
    )
    dedupe(steel_profile)
    steel = SteelBar(
        name="steel",
        density=7.85e-6,
        stress_strain_profile=steel_profile,
        colour="grey",
    )
    return concrete, steel


def bar_lines(lw):
    """Positions (mm from one end) and kinds of the bar lines along the wall length."""
    lb = 0.1 * lw
    xs = []
    # boundary zones: BOUNDARY_LINES lines from the cover to 0.1*lw, each end
    step = (lb - COVER_MM) / (BOUNDARY_LINES - 1)
    left = [COVER_MM + i * step for i in range(BOUNDARY_LINES)]
    right = [lw - x for x in left]
    n_web = max(1, round((lw - 2.0 * lb) / WEB_SPACING_MM) - 1)
    web_step = (lw - 2.0 * lb) / (n_web + 1)
    web = [lb + (i + 1) * web_step for i in range(n_web)]
    xs = [(x, "b") for x in left + right] + [(x, "w") for x in web]
    return xs, len(left), n_web


def section(case, eps_c_limit, eps_s_limit):
    lw = case["lw_m"] * 1000.0
    tw = case["tw_m"] * 1000.0
    concrete, steel = materials(case["fc_mpa"], case["fy_mpa"], eps_c_limit, eps_s_limit)
    # wall length along y (bending about x, theta = 0: compression at the top, y = lw)
    geom = rectangular_section(d=lw, b=tw, material=concrete)
    xs, n_b, n_web = bar_lines(lw)
    a_boundary = case["rho_boundary"] * 0.1 * lw * tw  # one end
    a_web = case["rho_web"] * 0.8 * lw * tw
    for y, kind in xs:
        # the two face bars of a line have the same strain under in-plane bending: one
        # lumped bar of the line's area at mid-thickness
        line = a_boundary / n_b if kind == "b" else a_web / n_web
        geom = add_bar(geom, area=line, material=steel, x=tw / 2.0, y=y, n=4)
    sec = ConcreteSection(geom)
    return sec, xs


def end_of_curve(case, eps_c_limit, eps_s_limit, steps):
    """Last point of the moment-curvature analysis (curvature 1/mm, moment Nmm)."""
    sec, _ = section(case, eps_c_limit, eps_s_limit)
    n = case["nu"] * case["fc_mpa"] * case["lw_m"] * case["tw_m"] * 1.0e6  # N
    lw = case["lw_m"] * 1000.0
    phi_guess = 2.0 * case["fy_mpa"] / ES_MPA / lw
    mk = sec.moment_curvature_analysis(
        theta=0.0,
        n=n,
        # the end point is found by the library's bisection on the failure strain, so the
        # step only needs to bracket it; `steps` steps per estimated yield curvature
        kappa_inc=phi_guess / steps,
        kappa_inc_max=phi_guess / steps,
        progress_bar=False,
    )
    limited_by = type(mk.failure_geometry.material).__name__
    return mk.kappa[-1], mk.m_xy[-1], limited_by


def analyse(case):
    eps_y = case["fy_mpa"] / ES_MPA
    k1, m1, by1 = end_of_curve(case, 0.002, eps_y, 4.0)
    kn, mn, byn = end_of_curve(case, 0.004, 0.015, 1.0)
    phi_first = k1 * 1000.0  # 1/m
    return {
        **case,
        "phi_y_first": phi_first,
        "m_y_first_knm": m1 / 1.0e6,
        "m_n_knm": mn / 1.0e6,
        "phi_n": kn * 1000.0,
        "phi_y": phi_first * mn / m1,
        "first_yield_by": "steel" if by1 == "SteelBar" else "concrete",
        "nominal_by": "steel" if byn == "SteelBar" else "concrete",
    }


def beta1(fc):
    """ACI 318-19 Table 22.2.2.4.3."""
    return min(0.85, max(0.65, 0.85 - 0.05 * (fc - 28.0) / 7.0))


def neutral_axis(case):
    """Neutral-axis depth c (m) at the nominal moment of a wall with its vertical steel
    rho_web distributed uniformly over its length (no boundary steel), by the library's
    ultimate analysis with the ACI 318-19 section 22.2 assumptions: rectangular stress block
    0.85 fc over beta1*c (Table 22.2.2.4.3), extreme-fibre strain 0.003, elastic-perfectly
    plastic steel. Bar lines at about 250 mm, the first at 50 mm from each end."""
    lw = case["lw_m"] * 1000.0
    tw = case["tw_m"] * 1000.0
    fc = case["fc_mpa"]
    concrete, steel = materials(fc, case["fy_mpa"], 0.004, 0.015)
    concrete.ultimate_stress_strain_profile = RectangularStressBlock(
        compressive_strength=fc, alpha=0.85, gamma=beta1(fc), ultimate_strain=0.003
    )
    geom = rectangular_section(d=lw, b=tw, material=concrete)
    n_lines = max(2, round((lw - 100.0) / WEB_SPACING_MM) + 1)
    step = (lw - 100.0) / (n_lines - 1)
    area = case["rho_web"] * lw * tw / n_lines
    for i in range(n_lines):
        geom = add_bar(geom, area=area, material=steel, x=tw / 2.0, y=50.0 + i * step, n=4)
    sec = ConcreteSection(geom)
    n = case["nu"] * fc * case["lw_m"] * case["tw_m"] * 1.0e6
    res = sec.ultimate_bending_capacity(theta=0.0, n=n)
    return {**case, "c_m": res.d_n / 1000.0, "beta1": beta1(fc)}


def analyse_case(case):
    if case.get("analysis") == "neutral_axis":
        return neutral_axis(case)
    return analyse(case)


def main():
    cases = json.load(sys.stdin)
    # two worker processes: the cases are independent and each takes some seconds
    with multiprocessing.Pool(processes=min(2, max(1, len(cases)))) as pool:
        results = pool.map(analyse_case, cases)
    json.dump(results, sys.stdout, indent=1)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
