/**
 * Plain ASCII for text that goes into C comments and CSV headers (firmware toolchains and some
 * spreadsheets mishandle UTF-8). Known symbols become their usual ASCII spelling; anything else '?'.
 */
const REPLACEMENTS: Readonly<Record<string, string>> = {
  '·': '*',
  '−': '-',
  '–': '-',
  '—': '--',
  '∫': 'integral ',
  θ: 'theta',
  ψ: 'psi',
  ζ: 'zeta',
  ω: 'omega',
  τ: 'tau',
  δ: 'delta',
  '²': '^2',
  '³': '^3',
  '°': ' deg',
  '≤': '<=',
  '≥': '>=',
  '→': '->',
  '±': '+/-',
  '×': 'x',
  é: 'e',
  '’': "'",
  '“': '"',
  '”': '"',
  '…': '...',
  '√': 'sqrt',
  Δ: 'd',
  Å: 'A',
  å: 'a',
  ä: 'a',
  ö: 'o',
  κ: 'kappa',
};

export function toAscii(text: string): string {
  let out = '';
  for (const character of text) {
    const code = character.codePointAt(0) ?? 0;
    out += code < 128 ? character : (REPLACEMENTS[character] ?? '?');
  }
  return out;
}
