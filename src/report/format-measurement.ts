/** The minus sign of typography (U+2212), wider than a hyphen and aligned with the plus sign. */
const MINUS = "−";
const SUPERSCRIPT: Record<string, string> = {
  "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹",
};

/**
 * The power of ten of the last digit to keep for an uncertainty, by the rounding rule of the Particle
 * Data Group (Review of Particle Physics, Introduction, "Rounding"): read the three leading digits of the
 * error; 100-354 keep two significant digits, 355-949 keep one, 950-999 round up to 1000 and keep two.
 *
 * @example lastDigitPower(0.119) // -2 (0.12)   lastDigitPower(0.367) // -1 (0.4)
 */
export function lastDigitPower(error: number): number {
  let exponent = Math.floor(Math.log10(error));
  let leading = Math.round(error / 10 ** (exponent - 2));
  if (leading >= 1000) {
    exponent += 1;
    leading = Math.round(leading / 10);
  }
  if (leading <= 354) return exponent - 1;
  if (leading <= 949) return exponent;
  // 950-999 becomes 1000, i.e. 1.0 x 10^(exponent+1): two significant digits end at 10^exponent.
  return exponent;
}

/**
 * A measurement with asymmetric errors as text, rounded by the Particle Data Group rule applied to the
 * smaller error (so neither error loses its leading digits); the value keeps the same last digit.
 * Equal rounded errors print as "±". Very large or small values use a shared power of ten.
 *
 * @example formatMeasurement(312.4, 61.7, 79.2) // "310 +80/−60"
 * @example formatMeasurement(0.827, 0.119, 0.119) // "0.83 ± 0.12"
 */
export function formatMeasurement(value: number, minusError: number, plusError: number): string {
  if (!Number.isFinite(value)) return String(value);
  const smaller = Math.min(Math.abs(minusError), Math.abs(plusError));
  if (!(smaller > 0) || !Number.isFinite(smaller)) return formatPlain(value);
  const magnitude = value === 0 ? 0 : Math.floor(Math.log10(Math.abs(value)));
  const errorMagnitude = Math.floor(Math.log10(smaller));
  const biggest = Math.max(magnitude, errorMagnitude);
  const scientific = biggest >= 6 || biggest < -3;
  const shift = scientific ? biggest : 0;
  const scale = 10 ** shift;
  const text = formatScaled(value / scale, Math.abs(minusError) / scale, Math.abs(plusError) / scale);
  return scientific ? `(${text}) × 10${superscript(shift)}` : text;
}

function formatScaled(value: number, minusError: number, plusError: number): string {
  const power = lastDigitPower(Math.min(minusError, plusError));
  const central = formatAtDigit(value, power);
  const minus = formatAtDigit(minusError, power);
  const plus = formatAtDigit(plusError, power);
  return minus === plus ? `${central} ± ${plus}` : `${central} +${plus}/${MINUS}${minus}`;
}

/**
 * A number rounded to the digit at 10^power (from {@link lastDigitPower}), so that interval bounds
 * print with the precision their uncertainty allows.
 *
 * @example formatAtDigit(466.04, 1) // "470"   formatAtDigit(-0.1919, -3) // "−0.192"
 */
export function formatAtDigit(value: number, power: number): string {
  if (!Number.isFinite(value)) return String(value);
  const rounded = Math.round(value / 10 ** power) * 10 ** power;
  return signed(rounded.toFixed(Math.max(0, -power)));
}

function formatPlain(value: number): string {
  return signed(Number(value.toPrecision(3)).toString());
}

function signed(text: string): string {
  if (/^-0(\.0*)?$/.test(text)) return text.slice(1);
  return text.startsWith("-") ? MINUS + text.slice(1) : text;
}

function superscript(exponent: number): string {
  return String(exponent)
    .split("")
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join("");
}

/**
 * A plain number to `digits` significant digits, with a typographic minus, and exponent notation only
 * outside 1e-3 to 1e6 where fixed notation would be unreadable.
 *
 * @example formatSignificant(1234.567, 3) // "1230"   formatSignificant(-2.5e-5, 2) // "−2.5e-5"
 */
export function formatSignificant(value: number, digits = 3): string {
  if (!Number.isFinite(value)) return String(value);
  const rounded = Number(value.toPrecision(digits));
  const text =
    Math.abs(rounded) >= 1e6 || (rounded !== 0 && Math.abs(rounded) < 1e-3)
      ? rounded.toExponential(Math.max(0, digits - 1)).replace(/\.?0+e/, "e").replace("e+", "e")
      : String(rounded);
  return signed(text);
}

/**
 * A convergence figure (R-hat, ESS, autocorrelation time) for text: `digits` significant digits, or
 * "not computed" when it is missing or not finite (too few draws to compute it; a result file stores
 * NaN as null), so that no summary prints "NaN" as if it were a value.
 */
export function convergenceFigure(value: number | null | undefined, digits = 4): string {
  return typeof value === "number" && Number.isFinite(value) ? formatSignificant(value, digits) : "not computed";
}
