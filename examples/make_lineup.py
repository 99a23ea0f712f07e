"""Generate the invented Corvel Lightworks demo line-up into ``examples/lineup/``.

Corvel Lightworks is a made-up company and every product, number and spectrum here is invented for the
demo: nothing was measured. Each product is built from a stated physical model (Gaussian LED emission,
line spectra, Planck's law) and scaled to a plausible absolute level at a stated measurement distance.
For every product the script writes one spectral irradiance CSV and one TOML product record with the
same file stem.

Run from anywhere: ``python examples/make_lineup.py``. Only numpy and the standard library are used.
"""

from __future__ import annotations

import dataclasses
import inspect
import math
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

import numpy as np

# Exact SI defining constants (CODATA 2018).
PLANCK_J_S = 6.62607015e-34
LIGHT_SPEED_M_S = 299792458.0
BOLTZMANN_J_K = 1.380649e-23
AVOGADRO_PER_MOL = 6.02214076e23

FWHM_PER_SIGMA = 2.0 * math.sqrt(2.0 * math.log(2.0))
OUT_DIR = Path(__file__).resolve().parent / "lineup"
COMPANY = "Corvel Lightworks"
FLOOR = 1e-12
"""Relative level below which a spectral value is written as zero [1]."""
NOTICE = "Invented demo data: Corvel Lightworks (a made-up company). Not a real product or measurement."


@dataclass(frozen=True)
class Product:
    """One invented product: its record fields and its spectral irradiance.

    Attributes
    ----------
    id : str
        Product identifier; its lower-case form is the file stem.
    name : str
        Human-readable name.
    distance_mm : float
        Distance at which the spectrum is stated [mm].
    size : dict
        Source size record fields, e.g. ``{"source_diameter_mm": 30.0}`` [mm] or [mrad].
    size_note : str
        What the source size is, for the record's comment.
    lamp_type : str
        ``"gls"`` or ``"other"``.
    wavelength_nm : numpy.ndarray
        Wavelength grid [nm].
    irradiance : numpy.ndarray
        Spectral irradiance at ``distance_mm`` [W m⁻² nm⁻¹]; for a pulsed source with ``per_pulse``, the
        radiant exposure of one pulse [J m⁻² nm⁻¹].
    pulses : dict
        Record fields of a pulsed source (``emission``, ``pulse_duration_s``, ``pulse_rate_hz``); empty for a
        continuous one.
    per_pulse : bool
        The spectrum is one pulse's radiant exposure (``quantity = "radiant_exposure"``).
    """

    id: str
    name: str
    distance_mm: float
    size: dict[str, float]
    size_note: str
    lamp_type: str
    wavelength_nm: np.ndarray
    irradiance: np.ndarray
    pulses: dict[str, object] = dataclasses.field(default_factory=dict)
    per_pulse: bool = False

    @property
    def stem(self) -> str:
        """File stem of the CSV and the TOML record."""
        return self.id.lower()


# --- building blocks -------------------------------------------------------------------------------------


def grid(start_nm: float, stop_nm: float, step_nm: float) -> np.ndarray:
    """Evenly spaced wavelengths from ``start_nm`` to ``stop_nm`` inclusive [nm]."""
    count = round((stop_nm - start_nm) / step_nm) + 1
    return np.round(np.linspace(start_nm, stop_nm, count), 6)


def gaussian(wl_nm: np.ndarray, centre_nm: float, fwhm_nm: float) -> np.ndarray:
    """Gaussian band of unit area [nm⁻¹] with the given centre and full width at half maximum [nm]."""
    sigma = fwhm_nm / FWHM_PER_SIGMA
    return np.exp(-0.5 * ((wl_nm - centre_nm) / sigma) ** 2) / (sigma * math.sqrt(2.0 * math.pi))


def band_integral(wl_nm: np.ndarray, values: np.ndarray, lo_nm: float, hi_nm: float) -> float:
    """Trapezoid integral of ``values`` over the grid points in [lo_nm, hi_nm] [values·nm]."""
    inside = (wl_nm >= lo_nm) & (wl_nm <= hi_nm)
    return float(np.trapezoid(values[inside], wl_nm[inside]))


def scaled_to(wl_nm: np.ndarray, shape: np.ndarray, lo_nm: float, hi_nm: float, target: float) -> np.ndarray:
    """``shape`` multiplied so that its integral over [lo_nm, hi_nm] equals ``target``."""
    return shape * (target / band_integral(wl_nm, shape, lo_nm, hi_nm))


def planck_radiance(wl_nm: np.ndarray, temperature_k: float) -> np.ndarray:
    """Blackbody spectral radiance by Planck's law [W m⁻² sr⁻¹ nm⁻¹] at temperature [K]."""
    wl_m = wl_nm * 1e-9
    x = PLANCK_J_S * LIGHT_SPEED_M_S / (wl_m * BOLTZMANN_J_K * temperature_k)
    per_metre = 2.0 * PLANCK_J_S * LIGHT_SPEED_M_S**2 / wl_m**5 / np.expm1(x)
    return per_metre * 1e-9


def photon_irradiance_umol(
    wl_nm: np.ndarray, irradiance: np.ndarray, lo_nm: float = 400.0, hi_nm: float = 700.0
) -> float:
    """Photon irradiance over [lo_nm, hi_nm] [µmol m⁻² s⁻¹]; over 400-700 nm this is the PPFD."""
    photons_per_joule = wl_nm * 1e-9 / (PLANCK_J_S * LIGHT_SPEED_M_S)
    return band_integral(wl_nm, irradiance * photons_per_joule, lo_nm, hi_nm) / AVOGADRO_PER_MOL * 1e6


def white_led_shape(
    wl_nm: np.ndarray, pump_share: float, green_share: float, red_share: float, green_nm: float
) -> np.ndarray:
    """Relative phosphor-converted white LED spectrum of unit area [nm⁻¹].

    Blue InGaN pump: Gaussian at 450 nm, FWHM 20 nm. Garnet phosphor: Gaussian at green_nm [nm], FWHM
    110 nm. Nitride red phosphor: Gaussian at 625 nm, FWHM 90 nm. The shares are fractions of the radiant
    power [1] and must add to 1.
    """
    if not math.isclose(pump_share + green_share + red_share, 1.0):
        raise ValueError("the power shares must add to 1")
    return (
        pump_share * gaussian(wl_nm, 450.0, 20.0)
        + green_share * gaussian(wl_nm, green_nm, 110.0)
        + red_share * gaussian(wl_nm, 625.0, 90.0)
    )


# --- the products ----------------------------------------------------------------------------------------


def desk_lamp(irradiance_w_m2: float = 2.1, distance_mm: float = 500.0) -> Product:
    """Warm-white LED desk lamp, Corvel Lumen Desk 30 (general lighting service lamp).

    Physical model: phosphor-converted white LED. Blue pump Gaussian 450 nm, FWHM 20 nm, 8.5 % of the
    radiant power; garnet phosphor Gaussian 555 nm, FWHM 110 nm, 43.5 %; nitride red phosphor Gaussian
    625 nm, FWHM 90 nm, 48 %. This gives a correlated colour temperature near 3000 K close to the
    Planckian locus. Several mid-power LEDs behind a 30 mm opal diffuser.
    Level: irradiance_w_m2 [W/m2] over 380-780 nm at distance_mm [mm] below the head, about 700 lx.
    Grid 380-780 nm, 1 nm step; no emission outside it.
    """
    wl = grid(380.0, 780.0, 1.0)
    shape = white_led_shape(wl, pump_share=0.085, green_share=0.435, red_share=0.48, green_nm=555.0)
    return Product(
        "CL-DESK-30",
        "Corvel Lumen Desk 30 warm-white LED desk lamp",
        distance_mm,
        {"source_diameter_mm": 30.0},
        "opal diffuser, 30 mm across",
        "gls",
        wl,
        scaled_to(wl, shape, 380.0, 780.0, irradiance_w_m2),
    )


def cool_spotlight(irradiance_w_m2: float = 23.0, distance_mm: float = 1000.0) -> Product:
    """Cool-white chip-on-board LED spotlight, Corvel Beamline 65.

    Physical model: phosphor-converted white LED. Blue pump Gaussian 450 nm, FWHM 20 nm, 25 % of the
    radiant power; garnet phosphor Gaussian 550 nm, FWHM 110 nm, 59 %; nitride red phosphor Gaussian
    625 nm, FWHM 90 nm, 16 %. This gives a correlated colour temperature near 6500 K. A 19 mm COB
    (about 2000 lm) in a 60 mm faceted reflector, 24 degree beam; seen from the beam the reflector
    aperture appears fully lit at the COB's luminance (about 2.7e6 cd/m2).
    Level: irradiance_w_m2 [W/m2] over 380-780 nm on the beam axis at distance_mm [mm], about 7400 lx.
    Grid 380-780 nm, 1 nm step; no emission outside it.
    """
    wl = grid(380.0, 780.0, 1.0)
    shape = white_led_shape(wl, pump_share=0.25, green_share=0.59, red_share=0.16, green_nm=550.0)
    return Product(
        "CL-SPOT-65",
        "Corvel Beamline 65 cool-white COB spotlight",
        distance_mm,
        {"source_diameter_mm": 60.0},
        "reflector aperture, 60 mm, fully lit on axis",
        "other",
        wl,
        scaled_to(wl, shape, 380.0, 780.0, irradiance_w_m2),
    )


def uva_curing_lamp(
    peak_nm: float = 365.0, fwhm_nm: float = 10.0, irradiance_w_m2: float = 90.0, distance_mm: float = 300.0
) -> Product:
    """365 nm UV-A LED curing lamp, Corvel Setfast 365 (adhesive and coating curing).

    Physical model: four UV-A LEDs under a 25 mm glass lens, 30 degree beam, about 1.5 W optical output.
    Emission is one Gaussian band at peak_nm [nm] with full width at half maximum fwhm_nm [nm].
    Level: irradiance_w_m2 [W/m2] (all of it UV-A) on the beam axis at distance_mm [mm].
    Grid 300-450 nm, 1 nm step; no emission outside it.
    """
    wl = grid(300.0, 450.0, 1.0)
    return Product(
        "CL-CURE-365",
        "Corvel Setfast 365 UV-A LED curing lamp",
        distance_mm,
        {"source_diameter_mm": 25.0},
        "exit lens, 25 mm",
        "other",
        wl,
        scaled_to(wl, gaussian(wl, peak_nm, fwhm_nm), 300.0, 450.0, irradiance_w_m2),
    )


def germicidal_lamp(
    line_irradiance_w_m2: float = 0.36,
    slit_fwhm_nm: float = 1.0,
    continuum_fraction: float = 0.01,
    distance_mm: float = 500.0,
) -> Product:
    """254 nm low-pressure mercury germicidal lamp, Corvel Sterna 254 (4 W, T5 tube, ozone-free glass).

    Physical model: mercury emission lines (positions as commonly tabulated, e.g. NIST ASD) with these
    invented relative line irradiances: 253.7 nm 100; 296.7 nm 0.4; 312.6 nm 0.6; 313.2 nm 0.9;
    365.0 nm 1.5; 404.7 nm 1.8; 435.8 nm 3.5; 546.1 nm 3.0; 577.0 nm 0.6; 579.1 nm 0.7. Each line is a
    Gaussian of FWHM slit_fwhm_nm [nm], the instrument slit. The 185 nm line is absorbed by the glass.
    A flat weak continuum over 200-800 nm carries continuum_fraction [1] of the 253.7 nm line.
    Level: line_irradiance_w_m2 [W/m2] in the 253.7 nm line at distance_mm [mm] from the tube centre
    (about 0.9 W of UV-C from a 100 mm arc; 500 mm is five arc lengths, so the far-field law holds).
    Grid 200-800 nm, 0.5 nm step; no emission outside it.
    """
    lines = {
        253.7: 100.0,
        296.7: 0.4,
        312.6: 0.6,
        313.2: 0.9,
        365.0: 1.5,
        404.7: 1.8,
        435.8: 3.5,
        546.1: 3.0,
        577.0: 0.6,
        579.1: 0.7,
    }
    wl = grid(200.0, 800.0, 0.5)
    unit = line_irradiance_w_m2 / lines[253.7]
    spectrum = sum(unit * strength * gaussian(wl, centre, slit_fwhm_nm) for centre, strength in lines.items())
    spectrum = spectrum + continuum_fraction * line_irradiance_w_m2 / (800.0 - 200.0)
    return Product(
        "CL-GERM-254",
        "Corvel Sterna 254 low-pressure mercury germicidal lamp",
        distance_mm,
        {"source_width_mm": 16.0, "source_height_mm": 100.0},
        "T5 tube, 16 mm wide, 100 mm arc",
        "other",
        wl,
        spectrum,
    )


def far_uvc_lamp(irradiance_w_m2: float = 0.02, distance_mm: float = 500.0) -> Product:
    """222 nm far-UV-C KrCl excimer lamp, Corvel Farline 222 (filtered, for occupied-room air treatment).

    Physical model: KrCl* B-X emission as a Gaussian at 222 nm, FWHM 4 nm. What the short-pass filter
    lets through of the longer-wavelength emission is modelled as two weak side bands: a Gaussian at
    235 nm, FWHM 10 nm, with 1 % of the main peak height, and a Gaussian at 255 nm, FWHM 12 nm, with
    0.5 % of the main peak height. Emitting window 60 mm x 40 mm, about 16 mW of far-UV-C.
    Level: irradiance_w_m2 [W/m2] over 200-400 nm at distance_mm [mm] (2 uW/cm2).
    Grid 200-400 nm, 0.5 nm step; no emission outside it.
    """
    wl = grid(200.0, 400.0, 0.5)

    def height_one(centre_nm: float, fwhm_nm: float) -> np.ndarray:
        return gaussian(wl, centre_nm, fwhm_nm) / gaussian(np.array(centre_nm), centre_nm, fwhm_nm)

    shape = height_one(222.0, 4.0) + 0.01 * height_one(235.0, 10.0) + 0.005 * height_one(255.0, 12.0)
    return Product(
        "CL-FAR-222",
        "Corvel Farline 222 KrCl excimer far-UV-C lamp",
        distance_mm,
        {"source_width_mm": 60.0, "source_height_mm": 40.0},
        "emitting window, 60 mm x 40 mm",
        "other",
        wl,
        scaled_to(wl, shape, 200.0, 400.0, irradiance_w_m2),
    )


def ir_illuminator(
    peak_nm: float = 940.0, fwhm_nm: float = 40.0, irradiance_w_m2: float = 12.0, distance_mm: float = 1000.0
) -> Product:
    """940 nm infrared illuminator, Corvel Noctis 940 (for night-vision cameras).

    Physical model: an array of seven high-power 940 nm LEDs on a 30 mm circle behind a clear window,
    50 degree beam, about 5 W optical output. Emission is one Gaussian band at peak_nm [nm] with full
    width at half maximum fwhm_nm [nm]; no visible light (the source is a weak visual stimulus).
    Level: irradiance_w_m2 [W/m2] on the beam axis at distance_mm [mm].
    Grid 700-1200 nm, 1 nm step; no emission outside it.
    """
    wl = grid(700.0, 1200.0, 1.0)
    return Product(
        "CL-IR-940",
        "Corvel Noctis 940 infrared illuminator",
        distance_mm,
        {"source_diameter_mm": 30.0},
        "LED array behind its window, 30 mm across",
        "other",
        wl,
        scaled_to(wl, gaussian(wl, peak_nm, fwhm_nm), 700.0, 1200.0, irradiance_w_m2),
    )


def radiant_heater(
    temperature_k: float = 2900.0,
    emissivity: float = 0.35,
    envelope_transmittance: float = 0.92,
    uv_edge_nm: float = 370.0,
    uv_edge_width_nm: float = 8.0,
    filament_width_mm: float = 1.6,
    filament_length_mm: float = 250.0,
    reflector_gain: float = 2.0,
    distance_mm: float = 1250.0,
) -> Product:
    """Halogen radiant heater, Corvel Calora 2000 (2 kW quartz tungsten-halogen tube with reflector).

    Physical model: grey-body tungsten coil, spectral radiance emissivity x Planck(temperature_k), with
    temperature_k [K] and emissivity [1] constant over wavelength; Planck's law with the exact SI values
    h = 6.62607015e-34 J s, c = 299792458 m/s, k = 1.380649e-23 J/K. The UV-blocking doped-quartz
    envelope transmits envelope_transmittance [1] above a UV cut-on modelled as a logistic edge at
    uv_edge_nm [nm] of width uv_edge_width_nm [nm]. The coil's projected area is filament_width_mm x
    filament_length_mm [mm]; the reflector adds images of it, raising the on-axis intensity by
    reflector_gain [1]. Irradiance at distance_mm [mm] = radiance x projected area x gain / distance^2.
    The coil radiates about emissivity x sigma x T^4 x pi x width x length = 1.8 kW. distance_mm is five
    coil lengths, so the far-field law holds; scaling nearer overstates a line source's irradiance
    (conservative).
    Grid 300-3000 nm, 1 nm step. Below 300 nm the envelope leaves a negligible tail, taken as zero;
    emission beyond 3000 nm lies outside every hazard band.
    """
    wl = grid(300.0, 3000.0, 1.0)
    transmittance = envelope_transmittance / (1.0 + np.exp(-(wl - uv_edge_nm) / uv_edge_width_nm))
    radiance = emissivity * transmittance * planck_radiance(wl, temperature_k)
    area_m2 = filament_width_mm * filament_length_mm * 1e-6
    irradiance = radiance * area_m2 * reflector_gain / (distance_mm * 1e-3) ** 2
    return Product(
        "CL-HEAT-2K",
        "Corvel Calora 2000 halogen radiant heater",
        distance_mm,
        {"source_width_mm": filament_width_mm, "source_height_mm": filament_length_mm},
        "glowing tungsten coil, 1.6 mm x 250 mm",
        "other",
        wl,
        irradiance,
    )


def grow_spotlight(ppfd_umol: float = 1400.0, distance_mm: float = 300.0) -> Product:
    """Horticulture LED spotlight, Corvel Verdara 30 (30 W, red/blue with a little white).

    Physical model: deep-blue LEDs, Gaussian 450 nm, FWHM 20 nm, 28 % of the radiant power; deep-red
    LEDs, Gaussian 660 nm, FWHM 20 nm, 62 %; warm-white LEDs (the desk lamp's white model), 10 %.
    Photon ratio blue (400-500 nm) to red (600-700 nm) about 1:3. The LED cluster sits under a 22 mm
    collimating optic, 40 degree beam, whose aperture appears uniformly lit.
    Level: photosynthetic photon flux density ppfd_umol [umol/m2/s] over 400-700 nm on the beam axis at
    distance_mm [mm].
    Grid 380-780 nm, 1 nm step; no emission outside it.
    """
    wl = grid(380.0, 780.0, 1.0)
    white = white_led_shape(wl, pump_share=0.085, green_share=0.435, red_share=0.48, green_nm=555.0)
    shape = 0.28 * gaussian(wl, 450.0, 20.0) + 0.62 * gaussian(wl, 660.0, 20.0) + 0.10 * white
    return Product(
        "CL-GROW-30",
        "Corvel Verdara 30 horticulture LED spotlight",
        distance_mm,
        {"source_diameter_mm": 22.0},
        "collimating optic aperture, 22 mm",
        "other",
        wl,
        shape * (ppfd_umol / photon_irradiance_umol(wl, shape)),
    )


def indicator_led(
    peak_nm: float = 470.0, fwhm_nm: float = 25.0, irradiance_w_m2: float = 0.08, distance_mm: float = 100.0
) -> Product:
    """Blue status indicator, Corvel Pip 470 (one InGaN LED die, about 50 mcd, in a panel window).

    Physical model: one Gaussian band at peak_nm [nm] with full width at half maximum fwhm_nm [nm]; the
    2 mm lit die subtends 20 mrad at distance_mm [mm] (10 mrad at 200 mm, a small source).
    Level: irradiance_w_m2 [W/m2] at distance_mm [mm].
    Grid 380-600 nm, 1 nm step; no emission outside it.
    """
    wl = grid(380.0, 600.0, 1.0)
    return Product(
        "CL-PIP-470",
        "Corvel Pip 470 blue indicator LED",
        distance_mm,
        {"source_alpha_mrad": 20.0},
        "lit die, 2 mm (20 mrad at 100 mm)",
        "other",
        wl,
        scaled_to(wl, gaussian(wl, peak_nm, fwhm_nm), 380.0, 600.0, irradiance_w_m2),
    )


def xenon_flash_shape(wl_nm: np.ndarray, temperature_k: float, lines: dict[float, float]) -> np.ndarray:
    """A xenon flash spectrum: Planck continuum of the arc plasma at ``temperature_k`` [K] plus xenon lines.

    ``lines`` maps line centre [nm] to its peak height relative to the continuum's maximum; each line is a
    Gaussian of FWHM 3 nm (broadened in the dense arc). Returned relative to its own maximum [1].
    """
    continuum = planck_radiance(wl_nm, temperature_k)
    continuum = continuum / continuum.max()
    shape = continuum + sum(height * gaussian(wl_nm, centre, 3.0) for centre, height in lines.items())
    return shape / shape.max()


XENON_LINES = {823.2: 0.6, 828.0: 0.35, 881.9: 0.55, 904.5: 0.3, 916.3: 0.3, 980.0: 0.25, 992.3: 0.35}
"""Xenon near-infrared lines (positions as commonly tabulated, e.g. NIST ASD) with invented relative heights."""


def pulsed_xenon_disinfector(
    temperature_k: float = 11000.0,
    dose_per_pulse_j_m2: float = 0.6,
    pulse_duration_s: float = 100e-6,
    pulse_rate_hz: float = 2.0,
    distance_mm: float = 1000.0,
) -> Product:
    """Pulsed-xenon UV disinfection unit, Corvel Flashguard X (room surfaces, used with the room cleared).

    Physical model: a linear xenon flash tube in a UV-transmitting quartz envelope behind a 200 mm x 60 mm
    window; the arc plasma radiates as Planck's law at temperature_k [K] with xenon near-infrared lines
    (XENON_LINES). Each flash lasts pulse_duration_s [s] (half-peak width), pulse_rate_hz [Hz] flashes per
    second. Level: radiant exposure of one flash, dose_per_pulse_j_m2 [J/m2] over 200-1100 nm, on the axis
    at distance_mm [mm]. The spectrum is that of one flash, in J/m2/nm.
    Grid 200-1100 nm, 1 nm step; the envelope and window pass nothing outside it.
    """
    wl = grid(200.0, 1100.0, 1.0)
    shape = xenon_flash_shape(wl, temperature_k, XENON_LINES)
    return Product(
        "CL-XEN-UV",
        "Corvel Flashguard X pulsed-xenon UV disinfection unit",
        distance_mm,
        {"source_width_mm": 60.0, "source_height_mm": 200.0},
        "flash tube window, 60 mm x 200 mm",
        "other",
        wl,
        scaled_to(wl, shape, 200.0, 1100.0, dose_per_pulse_j_m2),
        {"emission": "pulse_train", "pulse_duration_s": pulse_duration_s, "pulse_rate_hz": pulse_rate_hz},
        per_pulse=True,
    )


def photoflash(
    temperature_k: float = 6500.0,
    uv_edge_nm: float = 390.0,
    dose_per_pulse_j_m2: float = 0.02,
    pulse_duration_s: float = 1e-3,
    distance_mm: float = 1000.0,
) -> Product:
    """Studio photoflash, Corvel Snapbright 400 (one flash per shot, a few seconds apart at most).

    Physical model: a xenon flash tube behind a UV-absorbing dome; the arc radiates as Planck's law at
    temperature_k [K] with the xenon near-infrared lines (XENON_LINES); the dome cuts the ultraviolet with a
    logistic edge at uv_edge_nm [nm], 6 nm wide. One flash lasts pulse_duration_s [s] (half-peak width).
    Level: radiant exposure of the flash, dose_per_pulse_j_m2 [J/m2] over 300-1100 nm, on the axis at
    distance_mm [mm]. The spectrum is that of one flash, in J/m2/nm.
    Grid 300-1100 nm, 1 nm step; the dome passes nothing outside it.
    """
    wl = grid(300.0, 1100.0, 1.0)
    dome = 1.0 / (1.0 + np.exp(-(wl - uv_edge_nm) / 6.0))
    shape = xenon_flash_shape(wl, temperature_k, XENON_LINES) * dome
    return Product(
        "CL-FLASH-400",
        "Corvel Snapbright 400 studio photoflash",
        distance_mm,
        {"source_width_mm": 80.0, "source_height_mm": 80.0},
        "flash dome, 80 mm across",
        "other",
        wl,
        scaled_to(wl, shape, 300.0, 1100.0, dose_per_pulse_j_m2),
        {"emission": "single_pulse", "pulse_duration_s": pulse_duration_s},
        per_pulse=True,
    )


MODELS: tuple[Callable[..., Product], ...] = (
    desk_lamp,
    cool_spotlight,
    uva_curing_lamp,
    germicidal_lamp,
    far_uvc_lamp,
    ir_illuminator,
    radiant_heater,
    grow_spotlight,
    indicator_led,
    pulsed_xenon_disinfector,
    photoflash,
)


# --- writing ---------------------------------------------------------------------------------------------


def parameters_text(model: Callable[..., Product]) -> str:
    """The model function's parameter values as ``name = value`` pairs."""
    return ", ".join(f"{name} = {p.default:g}" for name, p in inspect.signature(model).parameters.items())


def write_csv(product: Product, model: Callable[..., Product], folder: Path) -> Path:
    """Write the spectrum CSV with its ``#`` header: notice, product, model, parameters, distance, unit.

    Values below :data:`FLOOR` times the peak are written as 0 (Gaussian tails far below any instrument's
    dynamic range).
    """
    header = [NOTICE, f"Company: {COMPANY} (fictional). Product: {product.id}, {product.name}."]
    header += [line for line in inspect.getdoc(model).splitlines() if line.strip()]
    header += [
        f"Parameters: {parameters_text(model)}",
        f"Measurement distance: {product.distance_mm:g} mm",
        "Quantity: radiant exposure of one flash, unit J/m2/nm"
        if product.per_pulse
        else "Quantity: spectral irradiance, unit W/m2/nm",
    ]
    values = np.where(product.irradiance >= FLOOR * product.irradiance.max(), product.irradiance, 0.0)
    rows = [f"{w:.1f},{v:.6g}" for w, v in zip(product.wavelength_nm, values, strict=True)]
    path = folder / f"{product.stem}.csv"
    column = "radiant_exposure_J_m2_nm" if product.per_pulse else "irradiance_W_m2_nm"
    path.write_text(
        "".join(f"# {line}\n" for line in header) + f"wavelength_nm,{column}\n" + "\n".join(rows) + "\n",
        encoding="utf-8",
    )
    return path


UNCERTAINTY_PCT = 10.0
"""Invented expanded uncertainty (k = 2) of the spectral values, typical of a calibrated spectroradiometer [%]."""
WAVELENGTH_UNCERTAINTY_NM = 0.5
"""Invented uncertainty of the wavelength scale [nm]."""
CLAIMS = {
    "CL-SPOT-65": {"claimed_risk_group": "Exempt", "claimed_cct_k": 6500.0},
    "CL-DESK-30": {"claimed_risk_group": "Exempt", "claimed_cct_k": 3000.0},
}
"""Invented datasheet claims, for the vendor-claim check in the demo (one of them does not hold)."""
EXPOSURES = {
    "CL-CURE-365": [
        {"distance_mm": 1000.0, "duration_s": "2h", "label": "operator at the bench"},
        {"distance_mm": 300.0, "duration_s": "10min", "label": "loading parts under the lamp"},
    ],
    "CL-HEAT-2K": [
        {"distance_mm": 2000.0, "duration_s": "8h", "label": "workstation in the heated bay"},
        {"distance_mm": 500.0, "duration_s": "2min", "label": "adjusting the heater"},
    ],
    "CL-XEN-UV": [{"distance_mm": 3000.0, "duration_s": "5min", "label": "walking past the open door"}],
}
"""Invented working days for the daily-exposure study of the demo."""


def _toml_value(value) -> str:
    if isinstance(value, str):
        return f'"{value}"'
    return f"{value:.1f}" if abs(value) >= 1 else f"{value:g}"


def _exposure_tables(product_id: str) -> str:
    """The product's [[exposure]] tables (invented working day), or nothing."""
    tables = EXPOSURES.get(product_id, [])
    if not tables:
        return ""
    body = "".join(
        "\n[[exposure]]\n" + "".join(f"{key} = {_toml_value(value)}\n" for key, value in table.items())
        for table in tables
    )
    return "# A working day (invented):" + body


def write_record(product: Product, folder: Path) -> Path:
    """Write the TOML product record (flat fields)."""
    size = "\n".join(f"{key} = {value:.1f}" for key, value in product.size.items())
    claims = "".join(f"{key} = {_toml_value(value)}\n" for key, value in CLAIMS.get(product.id, {}).items())
    text = (
        f"# {NOTICE}\n"
        f"# Vendor: {COMPANY} (fictional). Source size: {product.size_note}.\n"
        f"# Spectrum {product.wavelength_nm[0]:g}-{product.wavelength_nm[-1]:g} nm; the model emits "
        "nothing else inside the 200-3000 nm hazard bands.\n"
        f'id = "{product.id}"\n'
        f'name = "{product.name}"\n'
        f'spectrum = "{product.stem}.csv"\n'
        + (
            'quantity = "radiant_exposure"\nunit = "J/m2/nm"\n'
            if product.per_pulse
            else 'quantity = "irradiance"\nunit = "W/m2/nm"\n'
        )
        + "".join(f"{key} = {_toml_value(value)}\n" for key, value in product.pulses.items())
        + f"distance_mm = {product.distance_mm:.1f}\n"
        f"{size}\n"
        f'lamp_type = "{product.lamp_type}"\n'
        "no_emission_outside = true\n"
        f'vendor = "{COMPANY}"\n'
        f"uncertainty_pct = {UNCERTAINTY_PCT:.1f}\n"
        f"wavelength_uncertainty_nm = {WAVELENGTH_UNCERTAINTY_NM:.1f}\n"
        + (f"# Datasheet claims (invented):\n{claims}" if claims else "")
        + _exposure_tables(product.id)
    )
    path = folder / f"{product.stem}.toml"
    path.write_text(text, encoding="utf-8")
    return path


def main() -> None:
    """Build every product model and write its CSV and TOML record into ``examples/lineup/``."""
    OUT_DIR.mkdir(parents=True, exist_ok=True)
    for model in MODELS:
        product = model()
        write_csv(product, model, OUT_DIR)
        write_record(product, OUT_DIR)
        print(f"{product.id:12s} {product.stem}.csv, {product.stem}.toml")


if __name__ == "__main__":
    main()
