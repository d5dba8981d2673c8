r"""Ionization energies with finite-mass, α² and α³ corrections, itemized, against measured data.

``I = E(ion 1s) - E(atom)``: each contribution is the difference of the same correction applied
to the one-electron ion (:mod:`.one_electron`) and to the two-electron state:

``nonrelativistic``  infinite-mass variational ionization energy;
``finite_mass``      reduced mass and mass polarization (exact, in the Hamiltonian);
``alpha2``           Breit–Pauli (atom, first order) vs Dirac 1s (ion, all orders);
``alpha3``           leading QED (Araki–Sucher/Kabir–Salpeter vs the 1s Lamb shift);
``alpha4_radiative`` the one-loop α(Zα)⁵-type term on both sides (a partial α⁴ term).

Not included: the other mα⁶ (α⁴) terms, α³ recoil, nuclear size and polarizability.  Their
size is estimated as ``0.2 α⁴ Z⁶`` Eh (0.008 cm⁻¹ for He, 124 cm⁻¹ for Ne⁸⁺; calibrated on the
NIST ASD residuals, see :mod:`.uncertainty`), which enters the stated uncertainty of ``I``.

References (``data/measured_ionization_energies.csv``) are measured values for He and H⁻; the
NIST Atomic Spectra Database ionization energies (A. Kramida, Yu. Ralchenko, J. Reader and NIST
ASD Team, NIST Atomic Spectra Database, https://physics.nist.gov/asd) of the ground states of
He-like ions Z = 2..10 are read from ``data/nist_ionization_energies.csv``.  Each is matched to
the computed isotope and state (:mod:`.matched_reference`).
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field
from typing import ClassVar

import numpy as np

from twoel import constants
from twoel._version import __version__
from twoel.solver.eigen import solve_generalized
from twoel.errors import InputError, NotBoundError, UnsupportedError
from twoel.basis.correlated import CorrelatedBasis
from twoel.basis.hylleraas import omega_terms
from twoel.reference import all_references
from twoel.results import Result, Wavefunction
from twoel.system import Ion, State
from twoel.units import convert_energy, hartree_to
from twoel.corrections.finite_mass import finite_mass_energy
from twoel.corrections.masses import nuclear_mass
from twoel.corrections.one_electron import one_electron_ion
from twoel.properties.operators import operator_values
from twoel.corrections.qed import qed_correction
from twoel.corrections.quadrature import quadrature_expectations
from twoel.corrections.relativistic import CAUTION_Z_ALPHA, breit_pauli_s
from twoel.corrections import matched_reference as matching
from twoel.corrections import uncertainty as budget

MEASURED_TABLE = "measured_ionization_energies.csv"

#: preset two-scale Hylleraas bases: state -> quality -> [(ω, α/unit, β/unit)], unit given
_PRESETS = {
    "ground": {"fast": [(8, 0.9, 1.1), (6, 2.25, 3.0)], "default": [(12, 0.9, 1.1), (10, 2.25, 3.0)]},
    "ground_h": {"fast": [(10, 1.0, 0.3), (8, 1.2, 0.6)],
                 "default": [(12, 0.95, 0.25), (10, 1.1, 0.5), (6, 2.5, 2.5)]},
    "excited": {"fast": [(8, 1.0, 0.6), (6, 1.15, 1.4)], "default": [(12, 1.0, 0.6), (9, 1.15, 1.4)]},
}
QUALITIES = ("fast", "default")


def preset_basis(Z: float, state: State, quality: str = "default") -> CorrelatedBasis:
    """A fixed two-scale Hylleraas basis ``Σ r1^i r2^j r12^k e^{-α r1 - β r2}`` for the state.

    Exponents scale with ``Z`` (inner electron) and ``Z - 1`` (outer electron of ``2S``); they
    were chosen once for He and H⁻ (errors about 3e-11, 1e-8 (2¹S), 5e-11 (2³S), 2e-10 (H⁻) Eh).
    """
    if quality not in QUALITIES:
        raise InputError(f"quality must be one of {', '.join(QUALITIES)}, got {quality!r}")
    if state.L != 0 or state.n > 2:
        raise UnsupportedError(f"no preset basis for {state.label}: the spectrum corrections support "
                               "1^1S, 2^1S and 2^3S (S states up to n = 2)")
    powers, exps = [], []
    if state.n == 1:
        key = "ground" if Z >= 1.5 else "ground_h"
        for omega, a, b in _PRESETS[key][quality]:
            scale = Z / 2 if key == "ground" else Z
            t = omega_terms(omega, False, state.exchange_sign)
            powers += t
            exps += [(a * 2 * scale, b * 2 * scale, 0.0)] * len(t) if key == "ground" else [(a * Z, b * Z, 0.0)] * len(t)
    else:
        if Z < 1.5:
            raise UnsupportedError(f"{state.label} is not bound for Z = {Z:g}")
        for omega, a, b in _PRESETS["excited"][quality]:
            t = omega_terms(omega, False, state.exchange_sign)
            powers += t
            exps += [(a * Z, b * (Z - 1.0), 0.0)] * len(t)
    return CorrelatedBasis(np.array(powers), np.array(exps), sign=state.exchange_sign)


def measured_reference(Z: float, state: State):
    """The measured ionization energy in ``data/measured_ionization_energies.csv`` (or None)."""
    for row in all_references(MEASURED_TABLE):
        if row.Z == float(Z) and row.state == state.label and row.quantity == "ionization_energy":
            return row
    return None


def nist_ionization_energy_ev(Z: int) -> float | None:
    """NIST ASD ionization energy (eV) of the He-like ion of charge ``Z`` (Z = 2..10), from
    ``data/nist_ionization_energies.csv`` (for the isotope named there), else ``None``."""
    row = matching.nist_row(Z) if Z >= 2 else None
    return None if row is None else float(row["value_ev"])


def _cm1(value_hartree: float) -> float:
    return hartree_to(value_hartree, "cm-1")


@dataclass(frozen=True, repr=False)
class SpectrumResult(Result):
    """Itemized ionization energy of one state (contributions in Eh; see ``to_dict`` for cm⁻¹).

    ``residual_cm1`` is ``I_computed - I_reference`` (cm⁻¹; ``residual`` is its older name), the
    reference matched to the computed isotope and state (``reference_match``, ``nist_match``:
    :meth:`.MatchedReference.to_dict` records).  ``uncertainty_hartree`` is the budget of
    :mod:`.uncertainty` (pieces and ``total``, Eh).
    ``atom``, ``threshold`` and ``bethe_log`` hold the ``to_dict()`` records of the pieces
    (:class:`~twoel.properties.operators.OperatorValues`, :class:`.BreitPauli`,
    :class:`.QEDCorrection`, :class:`.FiniteMassEnergy`, :class:`.OneElectronIon`,
    :class:`.BetheLog`).
    """

    ALIASES: ClassVar[dict] = {"residual": "residual_cm1"}
    SUMMARY: ClassVar[tuple] = ("ion", "state", "ionization_energy_cm1")

    Z: float
    ion: str
    state: str
    isotope: str
    nuclear_mass_me: float
    contributions_hartree: dict
    reference_cm1: float | None
    reference_source: str | None
    nist_cm1: float | None
    atom: dict
    threshold: dict
    bethe_log: dict
    cautions: tuple
    notes: tuple
    provenance: dict = field(default_factory=dict)
    reference_match: dict | None = None
    nist_match: dict | None = None
    uncertainty_hartree: dict = field(default_factory=dict)

    @property
    def ionization_energy_hartree(self) -> float:
        return float(sum(self.contributions_hartree.values()))

    @property
    def ionization_energy_cm1(self) -> float:
        return _cm1(self.ionization_energy_hartree)

    @property
    def residual_cm1(self) -> float | None:
        return None if self.reference_cm1 is None else self.ionization_energy_cm1 - self.reference_cm1

    @property
    def ionization_energy_uncertainty_cm1(self) -> float | None:
        total = self.uncertainty_hartree.get("total")
        return None if total is None else _cm1(total)

    def _residual_uncertainty(self, match: dict | None) -> float | None:
        u = self.ionization_energy_uncertainty_cm1
        if match is None or match["value_cm1"] is None or u is None:
            return None
        return budget.combined(u, match["uncertainty_cm1"])

    def _uncertainty_record(self) -> dict:
        u = self.ionization_energy_uncertainty_cm1
        ref_u = self._residual_uncertainty(self.reference_match)
        return {
            "ionization_energy_uncertainty_cm1": u,
            "ionization_energy_concise_cm1": budget.concise(self.ionization_energy_cm1, u),
            "uncertainty_budget_cm1": {k: None if v is None else _cm1(v)
                                       for k, v in self.uncertainty_hartree.items()},
            "uncertainty_model": budget.MODEL_TEXT,
            "reference_uncertainty_cm1": None if self.reference_match is None
            else self.reference_match["uncertainty_cm1"],
            "residual_uncertainty_cm1": ref_u,
            "residual_concise_cm1": None if ref_u is None else budget.concise(self.residual_cm1, ref_u),
            "reference_match": self.reference_match, "nist_match": self.nist_match,
            "nist_uncertainty_cm1": None if self.nist_match is None else self.nist_match["uncertainty_cm1"],
            "residual_nist_uncertainty_cm1": self._residual_uncertainty(self.nist_match),
        }

    def to_dict(self) -> dict:
        contributions_cm1 = {k: _cm1(v) for k, v in self.contributions_hartree.items()}
        contributions_ev = {k: hartree_to(v, "ev") for k, v in self.contributions_hartree.items()}
        nonrel = contributions_cm1["nonrelativistic"]
        return self._with_aliases({
            "Z": self.Z, "ion": self.ion, "state": self.state, "isotope": self.isotope,
            "nuclear_mass_me": self.nuclear_mass_me,
            "ionization_energy_cm1": self.ionization_energy_cm1,
            "ionization_energy_ev": hartree_to(self.ionization_energy_hartree, "ev"),
            "ionization_energy_hartree": self.ionization_energy_hartree,
            "contributions_cm1": contributions_cm1, "contributions_ev": contributions_ev,
            "reference_cm1": self.reference_cm1, "reference_source": self.reference_source,
            "residual_cm1": self.residual_cm1,
            "residual_nonrelativistic_cm1": None if self.reference_cm1 is None else nonrel - self.reference_cm1,
            "nist_cm1": self.nist_cm1,
            "nist_source": None if self.nist_cm1 is None else self.nist_match["source"],
            "residual_nist_cm1": None if self.nist_cm1 is None else self.ionization_energy_cm1 - self.nist_cm1,
            **self._uncertainty_record(),
            "atom": self.atom, "threshold": self.threshold, "bethe_log": self.bethe_log,
            "cautions": list(self.cautions), "notes": list(self.notes), "provenance": self.provenance,
        })


def _element_and_s_state(Z, state) -> tuple[Ion, State]:
    """The ion (a real element: the nuclear mass is needed) and the S state of the corrections."""
    ion = Ion.parse(Z)
    if ion.is_model:
        raise InputError("corrections need a real element (integer Z) for the nuclear mass")
    st = State.parse(state)
    if st.L != 0:
        raise UnsupportedError(f"{st.label}: the corrections are implemented for S states only; "
                               "the 2^3P fine structure needs P-state wavefunctions")
    return ion, st


def _atom_wavefunction(Z: float, st: State, quality: str, wavefunction):
    """The infinite-mass wavefunction: solved in the preset basis, or the given one.

    Returns
    -------
    wavefunction, root, energy, basis_note
        ``root`` and ``energy`` (Eh) are ``None`` for a given wavefunction.
    """
    if wavefunction is None:
        basis = preset_basis(Z, st, quality)
        from twoel.basis.correlated import build_matrices

        m0 = build_matrices(basis)
        eig = solve_generalized(m0.hamiltonian(Z), m0.overlap)
        if st.root >= eig.values.shape[0]:
            raise UnsupportedError(f"the preset basis has too few functions for {st.label}")
        wavefunction = Wavefunction(basis, eig.vectors[:, st.root].copy())
        root, energy = st.root, float(eig.values[st.root])
        basis_note = f"preset two-scale Hylleraas basis ({quality}), {basis.size} functions"
    else:
        basis, root, energy = wavefunction.basis, None, None
        basis_note = f"given wavefunction, {basis.size} functions"
    if not isinstance(basis, CorrelatedBasis):
        raise UnsupportedError("the corrections need a correlated S-state basis wavefunction")
    return wavefunction, root, energy, basis_note


@dataclass(frozen=True)
class _AtomPieces:
    """The two-electron side of :func:`compute_spectrum`: energy (Eh), operators and corrections."""

    energy: float
    values: object
    quad: dict
    fm: object
    bp: object
    qed: object
    uncertainty: dict = field(default_factory=dict)

    def record(self) -> dict:
        """The ``atom`` record of :class:`SpectrumResult`."""
        return {
            "energy_infinite_mass_hartree": self.energy,
            "finite_mass": self.fm.to_dict(),
            "operators": self.values.to_dict(),
            "quadrature": self.quad,
            "breit_pauli_hartree": self.bp.to_dict(),
            "qed_hartree": self.qed.to_dict(),
        }


def _atom_pieces(ion: Ion, st: State, wavefunction, energy, root, mass,
                 quadrature_nodes: int) -> _AtomPieces:
    """Operator values, finite-mass, Breit–Pauli and QED corrections of the bound atom state."""
    Zf, mu, basis = ion.Z, mass.reduced_mass_me, wavefunction.basis
    mats: dict = {}
    values = operator_values(wavefunction, Zf, energy, matrices_out=mats)
    energy = values.energy_hartree
    if not energy < ion.threshold_hartree:
        raise NotBoundError(f"{ion.label} {st.label}: energy {energy:.10f} Eh is not below the "
                            f"threshold {ion.threshold_hartree:.10f} Eh in this basis")
    if root is None:
        m0 = mats["system"]
        roots = solve_generalized(m0.hamiltonian(Zf), m0.overlap).values
        root = int(np.argmin(np.abs(roots - energy)))
    quad = quadrature_expectations(wavefunction, quadrature_nodes,
                                   delta_r12=values.delta_r12_direct if st.is_singlet else 0.0)
    fm = finite_mass_energy(basis, Zf, mass.nuclear_mass_me, root, energy, values.p1_dot_p2,
                            system=mats["system"], p12_matrix=mats["p1_dot_p2"])
    bp = breit_pauli_s(Zf, st, values, quad["orbit_orbit"], mu)
    qed = qed_correction(Zf, st, values.delta_r1_regularized,
                         values.delta_r12_regularized if st.is_singlet else 0.0,
                         quad["araki_sucher"], mu)
    qed_direct = qed_correction(Zf, st, values.delta_r1_direct,
                                values.delta_r12_direct if st.is_singlet else 0.0, quad["araki_sucher"], mu)
    u_nonrel = budget.nonrelativistic_uncertainty(mats["system"], basis, Zf, root, energy)
    uncertainty = _atom_uncertainty(Zf, st, values, quad, bp, qed, qed_direct, mu, u_nonrel)
    return _AtomPieces(energy, values, quad, fm, bp, qed, uncertainty)


def _atom_uncertainty(Z, st, values, quad, bp, qed, qed_direct, mu, u_nonrel) -> dict:
    """Numerical pieces of the budget of :mod:`.uncertainty` (Eh; ``nonrelativistic`` may be None)."""
    from twoel.corrections.qed import BETHE_TABLE, one_electron_qed_factor

    dlog = budget.bethe_log_error(st.label, qed.bethe_log.approximate, all_references(BETHE_TABLE))
    per_log = (one_electron_qed_factor(Z, 0.0) - one_electron_qed_factor(Z, 1.0)) * 2 * values.delta_r1_regularized
    quad_rel = max(abs(quad["inv_r12"] / values.inv_r12 - 1.0), abs(quad["p1_dot_p2"] / values.p1_dot_p2 - 1.0))
    qed_total = qed.alpha3_hartree + qed.alpha4_radiative_hartree
    return {
        "nonrelativistic": u_nonrel,
        "alpha2": abs(bp.total_hartree - bp.total_direct_hartree),
        "alpha3": budget.combined(abs(qed_direct.alpha3_hartree + qed_direct.alpha4_radiative_hartree - qed_total),
                                  dlog * per_log * mu**3),
        "quadrature": quad_rel * (abs(bp.orbit_orbit_hartree) + abs(qed.araki_sucher_hartree)),
    }


def _uncertainty(Z: float, atom: _AtomPieces, contributions: dict) -> dict:
    """The full budget (Eh): the atom's numerical pieces, finite mass and the omitted terms."""
    out = dict(atom.uncertainty)
    u_nonrel = out["nonrelativistic"]
    # the finite-mass energy comes from the same basis: the nonrelativistic relative error
    out["finite_mass"] = None if u_nonrel is None else \
        abs(contributions["finite_mass"]) * u_nonrel / abs(contributions["nonrelativistic"])
    out["omitted"] = budget.omitted_terms_hartree(Z)
    out["total"] = budget.combined(*out.values())
    return out


def _contributions(thr, atom: _AtomPieces) -> dict:
    """Each contribution to ``I``: the ion's correction minus the atom's (Eh)."""
    return {
        "nonrelativistic": thr.nonrelativistic_infinite_mass_hartree - atom.energy,
        "finite_mass": thr.finite_mass_hartree - (atom.fm.energy_exact_hartree - atom.energy),
        "alpha2": thr.relativistic_hartree - atom.bp.total_hartree,
        "alpha3": thr.qed_alpha3_hartree - atom.qed.alpha3_hartree,
        "alpha4_radiative": thr.qed_alpha4_hartree - atom.qed.alpha4_radiative_hartree,
    }


def _matched_references(ion: Ion, st: State, mass, atom: _AtomPieces, contributions: dict):
    """``(measured, nist)``: :class:`.MatchedReference` records (or ``None``) for this nucleus and state."""
    pieces = {"p1_dot_p2": atom.values.p1_dot_p2,
              "alpha_terms_cm1": _cm1(sum(v for k, v in contributions.items() if k.startswith("alpha"))),
              "second_order_hartree": atom.fm.second_order_hartree}
    common = {"symbol": ion.symbol,
              "state": st.label, "J": int(st.spin), "quantity": "ionization_energy"}
    measured = None
    row = measured_reference(ion.Z, st)
    if row is not None:
        A = matching.note_isotope(row.note)
        ref_mass = None if A is None else nuclear_mass(int(ion.Z), isotope=A).nuclear_mass_me
        unc = None if row.uncertainty is None else convert_energy(row.uncertainty, row.unit, "cm-1")
        measured = matching.match(convert_energy(row.value, row.unit, "cm-1"), unc, A, ref_mass, mass, pieces,
                                  source=row.source, key=row.key, table=MEASURED_TABLE, **common)
    nist = None
    nrow = matching.nist_row(ion.Z) if (st.n == 1 and st.is_singlet and ion.Z >= 2) else None
    if nrow is not None:
        nist = matching.match(float(nrow["value"]), float(nrow["uncertainty"]), int(nrow["isotope"]),
                              float(nrow["nuclear_mass_me"]), mass, pieces,
                              source=f"{matching.NIST_SOURCE}; ASD reference {nrow['asd_reference']}",
                              key=nrow["key"], table=matching.NIST_TABLE, **common)
    return measured, nist


def _reference_values(measured, nist) -> tuple:
    """``(reference_cm1, reference_source, nist_cm1, reference_match)``: measured, else NIST ASD."""
    chosen = next((m for m in (measured, nist) if m is not None and m.value_cm1 is not None),
                  measured or nist)
    if chosen is None:
        return None, None, None, None
    source = chosen.source
    if chosen.conversion is not None:
        source += f"; {chosen.reason} (shift {chosen.conversion['shift_cm1']:+.4f} cm-1)"
    elif chosen.value_cm1 is None:
        source += f"; {chosen.reason}"
    nist_cm1 = None if nist is None else nist.value_cm1
    return chosen.value_cm1, source, nist_cm1, chosen


#: the totals are printed to 1e-6 cm⁻¹: the omitted-term caution starts where they exceed it
PRINTED_PRECISION_CM1 = 1e-6
#: above this estimate of the omitted terms (cm⁻¹) the caution asks for all-order methods
ALL_ORDER_CM1 = 1.0


def _spectrum_cautions(Z: float, qed) -> list[str]:
    """Cautions on the omitted terms (estimated as ``C α⁴ Z⁶``) and an approximate Bethe logarithm."""
    omitted = _cm1(budget.omitted_terms_hartree(Z))
    cautions = []
    if omitted > PRINTED_PRECISION_CM1:
        text = (f"the omitted terms (mα⁶ beyond the one-loop radiative part, α³ recoil, nuclear size) are "
                f"estimated at {omitted:.2g} cm⁻¹ for Z = {Z:g} ({budget.OMITTED_COEFFICIENT} α⁴Z⁶ Eh, "
                "calibrated on the NIST ASD residuals Z = 2..10); digits of the totals below that are "
                "not significant")
        if omitted > ALL_ORDER_CM1:
            text += ("; first-order Breit–Pauli is the limit here: use all-order relativistic "
                     "(Dirac–Coulomb–Breit) and QED methods for better accuracy")
        cautions.append(text)
    if qed.bethe_log.approximate:
        cautions.append("Bethe logarithm from the hydrogenic-scaling approximation (no published "
                        "two-electron value in data/bethe_logarithms.csv)")
    return cautions


def _spectrum_notes(basis_note: str, mass, Z: float) -> tuple[str, ...]:
    return (
        basis_note,
        f"nuclear mass: {mass.source}",
        "not included: mα⁶ terms other than the one-loop radiative one, α³ recoil, nuclear size "
        f"and polarizability (estimated together at {_cm1(budget.omitted_terms_hartree(Z)):.2g} cm⁻¹ "
        "for this Z; part of the stated uncertainty)",
        "α² terms use the regularized (global-operator) deltas and p⁴ = 4(E−V)² − 2p1²p2²",
    )


def compute_spectrum(Z, state="1^1S", *, isotope: int | None = None, nuclear_mass_value: float | None = None,
                     mass_unit: str = "u", quality: str = "default", wavefunction=None,
                     quadrature_nodes: int = 40) -> SpectrumResult:
    """Corrected ionization energy of a two-electron S state, itemized.

    Parameters
    ----------
    Z : int
        Nuclear charge (an element: the nuclear mass is needed).
    state : str
        ``1^1S``, ``2^1S`` or ``2^3S`` with the preset bases; any S state with ``wavefunction``.
    isotope, nuclear_mass_value, mass_unit
        See :func:`twoel.corrections.masses.nuclear_mass` (default: most abundant isotope).
    quality : {"fast", "default"}
        Size of the preset basis.
    wavefunction : object with ``basis``/``coefficients``, optional
        An infinite-mass wavefunction (e.g. ``twoel.solve(...).wavefunction``) instead of the preset.
    quadrature_nodes : int
        Gauss–Laguerre nodes for the orbit–orbit and Araki–Sucher quadrature.
    """
    started = time.perf_counter()
    ion, st = _element_and_s_state(Z, state)
    Zf = ion.Z
    mass = nuclear_mass(int(Zf), isotope=isotope, mass=nuclear_mass_value, mass_unit=mass_unit)
    wavefunction, root, energy, basis_note = _atom_wavefunction(Zf, st, quality, wavefunction)
    atom = _atom_pieces(ion, st, wavefunction, energy, root, mass, quadrature_nodes)
    thr = one_electron_ion(Zf, mass.reduced_mass_me)
    contributions = _contributions(thr, atom)
    measured, nist = _matched_references(ion, st, mass, atom, contributions)
    ref_cm1, ref_source, nist_cm1, chosen = _reference_values(measured, nist)
    provenance = {"package": "twoel", "version": __version__, "method":
                  "variational nonrelativistic + first-order Breit–Pauli + α³ QED (itemized)",
                  "constants": constants.CODATA_EDITION, "alpha": constants.FINE_STRUCTURE.value,
                  "basis_functions": wavefunction.basis.size, "quadrature_nodes": quadrature_nodes,
                  "elapsed_seconds": time.perf_counter() - started}
    return SpectrumResult(
        Z=Zf, ion=ion.label, state=st.label, isotope=mass.label, nuclear_mass_me=mass.nuclear_mass_me,
        contributions_hartree=contributions, reference_cm1=ref_cm1,
        reference_source=ref_source, nist_cm1=nist_cm1, atom=atom.record(),
        threshold=thr.to_dict(), bethe_log=atom.qed.bethe_log.to_dict(),
        cautions=tuple(_spectrum_cautions(Zf, atom.qed)), notes=_spectrum_notes(basis_note, mass, Zf),
        provenance=provenance, reference_match=None if chosen is None else chosen.to_dict(),
        nist_match=None if nist is None else nist.to_dict(),
        uncertainty_hartree=_uncertainty(Zf, atom, contributions))


#: accuracy reached for the He 2³P intervals, measured against T. Zelevinsky, D. Farkas,
#: G. Gabrielse, Phys. Rev. Lett. 95, 203001 (2005) (ν01 = 29616.952 MHz, ν12 = 2291.176 MHz,
#: from memory) with the preset P basis and 32 nodes: ν01 +0.77 MHz (+2.6e-5), ν12 +0.67 MHz
#: (+2.9e-4); the omitted α³ terms are of this absolute size (~1 MHz) for every interval
FINE_STRUCTURE_ACCURACY = ("measured for He against Zelevinsky et al. (2005): J=0-1 off by +0.77 MHz "
                           "(+2.6e-5 relative), J=1-2 by +0.67 MHz (+2.9e-4); expect about 1 MHz "
                           "absolute (growing along the sequence), not a fixed relative accuracy")


def compute_fine_structure(Z, state="2^3P", nodes: int = 32) -> dict:
    """2³P_J fine-structure intervals (α² Breit–Pauli with the anomalous moment) vs measured.

    Returns a JSON-ready dict with the intervals ``E(J=0) - E(J=1)`` and ``E(J=1) - E(J=2)`` in
    MHz and cm⁻¹, the measured values (``data/measured_ionization_energies.csv``) and the
    relative residuals.  The centroid ionization energy of P states is not computed (the
    spin-independent α² and α³ terms are implemented for S states only).
    """
    from twoel.corrections.p_states import helium_like_3p_fine_structure

    started = time.perf_counter()
    ion = Ion.parse(Z)
    if ion.is_model:
        raise InputError("fine structure needs a real element (integer Z)")
    st = State.parse(state)
    if st.L != 1 or st.multiplicity != 3 or st.n != 2:
        raise UnsupportedError(f"{st.label}: among P states only the 2^3P fine structure is implemented")
    fs = helium_like_3p_fine_structure(ion.Z, nodes)
    out = {"Z": ion.Z, "ion": ion.label, "state": st.label,
           "ionization_energy_cm1": None, "contributions_cm1": {}, "reference_cm1": None, "residual": None,
           "energy_nonrelativistic_hartree": fs.energy_hartree, "fine_structure": {}, "cautions": [], "notes": [
               "α² Breit–Pauli spin–orbit, spin–other-orbit and spin–spin terms with the electron "
               "anomalous moment; α³ and higher corrections to the intervals are not included: "
               f"{FINE_STRUCTURE_ACCURACY}",
               "centroid ionization energy of P states not computed (S-state corrections only)"]}
    measured = {r.quantity: r for r in all_references(MEASURED_TABLE)
                if r.Z == ion.Z and r.state == st.label}
    for key, value in (("interval_01", fs.interval_01_hartree), ("interval_12", fs.interval_12_hartree)):
        entry = {"mhz": hartree_to(value, "mhz"), "cm1": _cm1(value), "measured_mhz": None,
                 "source": None, "relative_residual": None}
        row = measured.get(f"fine_structure_{key}")
        if row is not None:
            m = convert_energy(row.value, row.unit, "mhz")
            entry.update(measured_mhz=m, source=row.source, relative_residual=entry["mhz"] / m - 1.0)
        out["fine_structure"][key] = entry
    za = ion.Z * constants.FINE_STRUCTURE.value
    if za > CAUTION_Z_ALPHA:
        out["cautions"].append(f"Zα = {za:.3f} > {CAUTION_Z_ALPHA}: first-order Breit–Pauli fine structure "
                               "is inadequate; use fully relativistic methods")
    out["fine_structure"]["parameters_hartree"] = {"spin_orbit": fs.spin_orbit_hartree,
                                                   "spin_spin": fs.spin_spin_hartree,
                                                   "A_nuclear": fs.A_nuclear_au,
                                                   "A_electron": fs.A_electron_au,
                                                   "tensor": fs.tensor_au}
    out["provenance"] = {"package": "twoel", "version": __version__, "method":
                         "variational 2^3P (exact pair integrals, two-scale Hylleraas P basis) + first-order "
                         "Breit–Pauli fine structure (traces by quadrature)",
                         "quadrature_nodes": nodes, "constants": constants.CODATA_EDITION,
                         "elapsed_seconds": time.perf_counter() - started}
    return out
