// Password strength meter for the Account page (OWASP ASVS 4.0.3 V2.1.8): as a new password is
// typed, shows a rough estimate of how hard it is to guess. It only advises; the server's rules
// (length, the public list of common passwords) decide. Loaded as a module from this server, so
// the content security policy can forbid inline script; the page works without it.
//
// Method: guessing entropy ≈ length × log2(size of the character classes used), the usual brute-
// force estimate (common practice). Classes: a–z 26, A–Z 26, 0–9 10, ASCII punctuation and space
// 33, anything else (other scripts, emoji) 100, a deliberately low guess for the many code points
// of other scripts. A character that repeats the one before it or continues a run (abc, 321)
// counts a quarter, since guessers try those first.
// Notes: words are counted as letters, so "correct horse battery staple" scores higher than a
// dictionary attack would allow; the server's list check catches the commonest choices.

const CLASSES = [
  [/[a-z]/, 26],
  [/[A-Z]/, 26],
  [/[0-9]/, 10],
  [/[ -\/:-@\[-`{-~]/, 33],
  [/[^\x00-\x7f]/u, 100],
];

/** Estimated guessing entropy of a password, in bits (0 for the empty string). */
export function estimateBits(password) {
  const chars = [...password];
  if (chars.length === 0) return 0;
  let pool = 0;
  for (const [pattern, size] of CLASSES) if (pattern.test(password)) pool += size;
  let effective = 0;
  let previous = Number.NaN;
  for (const ch of chars) {
    const code = ch.codePointAt(0);
    effective += code === previous || Math.abs(code - previous) === 1 ? 0.25 : 1;
    previous = code;
  }
  return Math.round(effective * Math.log2(pool));
}

/**
 * What the meter shows: `score` 0–100 for the <meter> element and a sentence. Thresholds are
 * common practice (under 50 bits weak, 50–64 fair, 64–80 good, 80 and more strong).
 */
export function describePassword(password, minLength = 12, maxLength = 128) {
  const length = [...password].length;
  if (length === 0) return { score: 0, text: '' };
  if (length < minLength) return { score: Math.min(20, estimateBits(password)), text: `Too short: ${length} of at least ${minLength} characters.` };
  if (length > maxLength) return { score: 0, text: `Too long: ${length} characters; at most ${maxLength}.` };
  const bits = estimateBits(password);
  const word = bits < 50 ? 'Weak' : bits < 64 ? 'Fair' : bits < 80 ? 'Good' : 'Strong';
  return { score: Math.min(100, bits), text: `${word}: about ${bits} bits to guess (an estimate; the server checks the rules).` };
}

if (typeof document !== 'undefined') {
  for (const box of document.querySelectorAll('[data-password-meter]')) {
    const field = document.getElementById(box.getAttribute('data-password-meter') ?? '');
    const meter = box.querySelector('meter');
    const text = box.querySelector('[aria-live]');
    if (!field || !meter || !text) continue;
    const min = Number(box.getAttribute('data-min')) || 12;
    const max = Number(box.getAttribute('data-max')) || 128;
    const update = () => {
      const shown = describePassword(field.value, min, max);
      meter.value = shown.score;
      text.textContent = shown.text;
    };
    field.addEventListener('input', update);
    box.hidden = false;
    update();
  }
}
