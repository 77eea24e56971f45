/* qv-gas-thermo.h — thermochemistry of a molecule as an ideal gas of rigid
 * rotors with harmonic vibrations: translation (Sackur–Tetrode), rotation
 * (classical rigid rotor from the inertia tensor, symmetry number σ),
 * vibration (harmonic oscillators), electronic (degeneracy only). The
 * closed forms are the textbook ones (McQuarrie, Statistical Mechanics,
 * chs. 5, 8 and 10, from memory); with x = hcν̃/k_BT, per molecule:
 *   translation  q = (2πmk_BT/h²)^{3/2} V,  V = k_BT/p (or 1/(c N_A))
 *                S = k_B[ln q + 5/2], U = 3/2 k_BT, H = 5/2 k_BT
 *   rotation     linear:    q = T/(σΘ),  S = k_B[ln q + 1],   U = k_BT
 *                nonlinear: q = √π/σ · √(T³/(Θ_AΘ_BΘ_C)),
 *                           S = k_B[ln q + 3/2], U = 3/2 k_BT;  Θ = h²/(8π²Ik_B)
 *   vibration    ZPE = hcν̃/2, U_th = hcν̃/(e^x − 1), S = k_B[x/(e^x − 1) − ln(1 − e^{−x})],
 *                Cv = k_B x² e^x/(e^x − 1)²
 *   electronic   S = k_B ln g
 * and for every term G = H − TS; for the whole molecule H = U + k_BT and
 * Cp = Cv + k_B. An atom has translation (and electronic) terms only.
 *
 * Soft modes (low real wavenumbers, where the harmonic entropy grows
 * without bound as ν̃ → 0):
 *   QV_SOFT_MODES_RAISE — Ribeiro, Marenich, Cramer & Truhlar, J. Phys.
 *     Chem. B 115, 14556 (2011): every real wavenumber below the cut-off
 *     (100 cm⁻¹ there) is raised to the cut-off in the thermal energy, Cv
 *     and S of the vibrations. Our choice, documented in docs/methods.md:
 *     the zero-point energy keeps the computed wavenumber (it is the ground
 *     state of the computed curvature; the correction is about the thermal
 *     population of the soft mode).
 *   QV_SOFT_MODES_QUASI_RRHO — Grimme, Chem. Eur. J. 18, 9955 (2012): the
 *     entropy of each mode is w S_HO + (1 − w) S_FR with
 *     w = 1/(1 + (ω₀/ω)^α) (ω₀ = 100 cm⁻¹, α = 4 in the paper), S_FR the
 *     entropy of a free one-dimensional rotor with moment
 *     μ' = μ B_av/(μ + B_av), μ = h/(8π²ν), B_av = 10⁻⁴⁴ kg m² (the paper's
 *     value, from memory): S_FR = k_B[½ + ln √(8π³μ'k_BT/h²)]. Only the
 *     entropy changes (and G through it); energies and Cv stay harmonic.
 * Imaginary (and exactly zero) modes are left out and counted; the caller
 * warns. Scale factors: the frequency scale multiplies every wavenumber
 * before anything else (thermal terms and ZPE); the ZPE scale, when given,
 * replaces it in the zero-point energy.
 *
 * Plain data, no io: the structs are what the command line and the app
 * show. Units: eV and eV/K per molecule, K, Pa, cm⁻¹, u, u Å².
 * SPDX-License-Identifier: GPL-3.0-or-later */
#pragma once
#include <glib.h>
#include "qv-mode-set.h"
#include "qv-structure.h"

G_BEGIN_DECLS

typedef enum {
  QV_STANDARD_STATE_1BAR,     /* p = 10⁵ Pa (IUPAC standard, default) */
  QV_STANDARD_STATE_1ATM,     /* p = 101 325 Pa */
  QV_STANDARD_STATE_1M,       /* c = 1 mol/L: V = 1/(1000 N_A) m³ per molecule */
} QvStandardState;

typedef enum {
  QV_SOFT_MODES_NONE,         /* plain harmonic oscillators */
  QV_SOFT_MODES_RAISE,        /* Ribeiro et al. 2011 */
  QV_SOFT_MODES_QUASI_RRHO,   /* Grimme 2012 */
} QvSoftModes;

typedef enum {
  QV_ROTOR_ATOM,
  QV_ROTOR_LINEAR,
  QV_ROTOR_NONLINEAR,
} QvRotor;

/* Defaults, each from the paper that defines the treatment. */
#define QV_GAS_RAISE_CUTOFF 100.0       /* cm⁻¹, Ribeiro et al. 2011 */
#define QV_GAS_QRRHO_OMEGA0 100.0       /* cm⁻¹, Grimme 2012 */
#define QV_GAS_QRRHO_ALPHA 4.0          /* Grimme 2012 */
#define QV_GAS_QRRHO_B_AV 1e-44         /* kg m², Grimme 2012 (from memory) */
/* I_min/I_max below this makes a rotor linear (common practice: the
 * solver's rank test on the rotation vectors, squared). */
#define QV_GAS_LINEAR_TOLERANCE 1e-10

const char *qv_standard_state_name (QvStandardState state);   /* "1bar", "1atm", "1M" */
gboolean qv_standard_state_parse (const char *text, QvStandardState *state, GError **error);
const char *qv_soft_modes_name (QvSoftModes soft);            /* "none", "raise", "quasi-rrho" */
gboolean qv_soft_modes_parse (const char *text, QvSoftModes *soft, GError **error);
const char *qv_rotor_name (QvRotor rotor);                     /* "atom", "linear", "nonlinear" */

typedef struct {
  QvStandardState standard_state;
  double pressure;            /* Pa; > 0 replaces the standard state's (0: use it) */
  guint symmetry_number;      /* rotational σ ≥ 1 (default 1) */
  guint degeneracy;           /* electronic ground-state degeneracy ≥ 1, e.g. the
                                 spin multiplicity (default 1) */
  QvSoftModes soft_modes;
  double cutoff;              /* cm⁻¹ (raise) */
  double omega0;              /* cm⁻¹ (quasi-rrho) */
  double alpha;               /* (quasi-rrho) */
  double b_av;                /* kg m² (quasi-rrho) */
  double frequency_scale;     /* > 0, default 1 */
  double zpe_scale;           /* > 0, or 0: the frequency scale */
  gboolean has_electronic_energy;
  double electronic_energy;   /* eV */
} QvGasThermoOptions;

void qv_gas_thermo_options_init (QvGasThermoOptions *options);
/* QV_ERROR_USAGE, naming the field, for values outside their range. */
gboolean qv_gas_thermo_options_check (const QvGasThermoOptions *options, GError **error);

/* What the molecule is made of, for the formulas: mass, principal moments,
 * the vibrations to sum and what was left out. */
typedef struct {
  gsize n_atoms;
  double mass;                /* u */
  double moments[3];          /* principal moments of inertia, u Å², ascending */
  double axes[9];             /* principal axes, column k for moments[k] */
  QvRotor rotor;
  gsize n_modes;              /* all the modes given */
  double *wavenumbers;        /* n_modes, cm⁻¹, signed (negative: imaginary), as given */
  gboolean *used;             /* n_modes: TRUE for the vibrations summed */
  gsize n_vibrations;         /* modes summed */
  gsize n_imaginary;          /* imaginary modes left out */
  gsize n_zero;               /* exactly zero modes left out */
  gsize n_rigid;              /* modes beyond 3N−6 (3N−5) taken for rigid-body
                                 motion and left out: those of smallest |ν̃| */
  double most_imaginary;      /* cm⁻¹, the most negative left out (0: none) */
} QvGasMolecule;

/* From atoms (@positions 3N, Å; @masses N, u) and @n_modes wavenumbers
 * (cm⁻¹, negative = imaginary). @rotor_hint: QV_ROTOR_LINEAR or
 * QV_ROTOR_NONLINEAR to take the rotor from the caller (the solver's rank
 * test), or QV_ROTOR_ATOM to find it from the moments. QV_ERROR_INPUT when
 * there are fewer modes than vibrations (3N−6, linear 3N−5) or a value is
 * not finite; extra modes are taken as rigid-body motion (n_rigid). */
QvGasMolecule *qv_gas_molecule_new (gsize n_atoms, const double *positions, const double *masses,
                                    gsize n_modes, const double *wavenumbers, QvRotor rotor_hint,
                                    GError **error);
/* From a structure and its modes (all of them: a --lowest set is refused). */
QvGasMolecule *qv_gas_molecule_new_from_modes (const QvStructure *structure,
                                               const QvModeSet *modes, GError **error);
void qv_gas_molecule_free (QvGasMolecule *molecule);
G_DEFINE_AUTOPTR_CLEANUP_FUNC (QvGasMolecule, qv_gas_molecule_free)

/* One contribution (eV, eV/K per molecule). */
typedef struct {
  double zpe;                 /* zero-point energy (vibration only) */
  double energy;              /* U, including the ZPE */
  double enthalpy;            /* H */
  double entropy;             /* S */
  double heat_capacity;       /* Cv */
  double free_energy;         /* G = H − TS */
} QvGasTerm;

typedef struct {
  double temperature;         /* K */
  double pressure;            /* Pa in the translational term (for 1 M: c k_B T N_A) */
  QvGasTerm translation, rotation, vibration, electronic;
  QvGasTerm total;            /* sums; total.enthalpy = U + k_BT */
  double heat_capacity_p;     /* Cp = Cv + k_B, eV/K */
  double q_translation;       /* ln of the partition functions */
  double q_rotation;
  double rotational_temperatures[3];   /* Θ, K (atom: 0; linear: [0] = [1] = 0, [2] = Θ) */
  gboolean has_electronic_energy;
  double electronic_energy;   /* eV */
  double e_zpe, e_enthalpy, e_free_energy;   /* E_el + ZPE, + H, + G (eV) */
} QvGasThermo;

/* One vibration's share at one temperature. */
typedef struct {
  gsize mode;                 /* index into the molecule's modes, 0-based */
  double wavenumber;          /* cm⁻¹ as given (signed) */
  gboolean used;              /* FALSE: left out (imaginary, zero, rigid) */
  double scaled;              /* × frequency scale, cm⁻¹ */
  double thermal;             /* in the thermal terms (raised), cm⁻¹ */
  double weight;              /* quasi-RRHO w (1 otherwise) */
  double zpe, energy, entropy, heat_capacity, free_energy;   /* eV, eV/K */
  double entropy_harmonic;    /* S_HO at the scaled wavenumber, eV/K */
  double entropy_free_rotor;  /* S_FR (quasi-rrho; 0 otherwise), eV/K */
} QvGasMode;

/* Everything at one temperature @t > 0 K. @modes: NULL, or n_modes entries
 * (one per mode given, left-out ones with used = FALSE and zeros). The
 * options must have passed qv_gas_thermo_options_check. */
void qv_gas_thermo_compute (const QvGasMolecule *molecule, const QvGasThermoOptions *options,
                            double t, QvGasThermo *out, QvGasMode *modes);

/* A sweep: @n_t temperatures (each > 0 K) into @out (n_t entries). */
void qv_gas_thermo_sweep (const QvGasMolecule *molecule, const QvGasThermoOptions *options,
                          const double *t, gsize n_t, QvGasThermo *out);

/* The pieces, for tests and tables. Wavenumbers in cm⁻¹, T in K, eV/K. */
double qv_gas_grimme_weight (double wavenumber, double omega0, double alpha);
double qv_gas_harmonic_entropy (double wavenumber, double t);
double qv_gas_free_rotor_entropy (double wavenumber, double t, double b_av);
/* The pressure (Pa) the translational term uses at @t. */
double qv_gas_thermo_pressure (const QvGasThermoOptions *options, double t);

/* 1 eV per molecule in kJ/mol (e N_A / 1000). */
double qv_gas_kj_per_mol (void);

G_END_DECLS
