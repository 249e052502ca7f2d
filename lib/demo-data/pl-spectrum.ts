/**
 * PL spectrum of an NV ensemble spot: the NV⁰ (575.1 nm) and NV⁻ (637.4 nm) zero-phonon lines
 * (Davies & Hamer 1976, via lib/physics/constants) as narrow Lorentzians on their phonon
 * sidebands (sums of Gaussians, the NV⁻ band peaking near 690 nm), a dark-count offset and
 * Poisson noise. CSV with header `wavelength (nm),counts`.
 */
import type { DemoFile } from "./types";
import { Rng } from "./prng";
import { fixed, gauss, linSpace, lorentz } from "./numeric";
import { SAMPLE, SPECTROMETER, commentHeader, measuredAt, standardHeader } from "./scenario";
import { NV_MINUS_ZPL_ENERGY_EV, NV_ZERO_ZPL_ENERGY_EV } from "@/lib/physics/constants";
import { photonWavelengthNm } from "@/lib/physics/photon";

export const DARK_COUNTS = 310;

interface Band {
  centre: number;
  fwhm: number;
  peak: number;
}

/** Phonon sidebands (nm, counts): NV⁻ dominant near 690 nm, a weaker NV⁰ band near 600–630 nm. */
const SIDEBANDS: readonly Band[] = [
  { centre: 600, fwhm: 28, peak: 240 },
  { centre: 628, fwhm: 34, peak: 260 },
  { centre: 662, fwhm: 34, peak: 1500 },
  { centre: 692, fwhm: 52, peak: 2700 },
  { centre: 742, fwhm: 62, peak: 1350 },
];

export function plSpectrumFiles(): DemoFile[] {
  const rng = new Rng("pl-spectrum/K17-as-grown/spot-2");
  const group = "as-grown" as const;
  const nvMinus: Band = { centre: photonWavelengthNm(NV_MINUS_ZPL_ENERGY_EV), fwhm: 1.6, peak: 820 };
  const nvZero: Band = { centre: photonWavelengthNm(NV_ZERO_ZPL_ENERGY_EV), fwhm: 2.2, peak: 260 };
  const wavelengths = linSpace(550, 800, 1251);

  const rows = wavelengths.map((w) => {
    let mean = DARK_COUNTS;
    for (const b of SIDEBANDS) mean += b.peak * gauss(w, b.centre, b.fwhm);
    mean += nvMinus.peak * lorentz(w, nvMinus.centre, nvMinus.fwhm);
    mean += nvZero.peak * lorentz(w, nvZero.centre, nvZero.fwhm);
    return `${fixed(w, 2)},${rng.poisson(mean)}`;
  });

  // Lorentzian area = (π/2)·peak·FWHM.
  const area = (b: Band) => (Math.PI / 2) * b.peak * b.fwhm;
  const when = measuredAt(1, 27, 15, 40);
  const header = commentHeader([
    ["title", "PL spectrum, ensemble spot 2"],
    ...standardHeader(SPECTROMETER, group, when),
    ["excitation", "532 nm, 2 mW"],
    ["grating", "300 lines/mm, blaze 750 nm"],
    ["integration", "30 s, 1 accumulation"],
    ["wavelength", "vacuum, calibrated with a Ne lamp"],
  ]);
  const content = header + "wavelength (nm),counts\n" + rows.join("\n") + "\n";
  return [
    {
      fileName: `pl-spectrum_${SAMPLE}-as-grown_spot2.csv`,
      name: `PL spectrum, as-grown spot 2 (sample ${SAMPLE})`,
      kind: "pl_spectrum",
      sample: SAMPLE,
      instrument: SPECTROMETER,
      measuredAt: when,
      notes:
        `Generated: NV⁻ ZPL at ${fixed(nvMinus.centre, 2)} nm (FWHM ${nvMinus.fwhm} nm, peak ${nvMinus.peak} counts, ` +
        `area ${fixed(area(nvMinus), 0)} counts·nm) and NV⁰ ZPL at ${fixed(nvZero.centre, 2)} nm (FWHM ${nvZero.fwhm} nm, ` +
        `peak ${nvZero.peak} counts, area ${fixed(area(nvZero), 0)} counts·nm) as Lorentzians; NV⁻:NV⁰ ZPL area ratio ` +
        `${fixed(area(nvMinus) / area(nvZero), 3)}. Phonon sideband: Gaussians at ${SIDEBANDS.map((b) => b.centre).join(", ")} nm. ` +
        `Dark offset ${DARK_COUNTS} counts, Poisson noise.`,
      tags: { group, spot: "2" },
      content,
    },
  ];
}
