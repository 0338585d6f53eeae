/**
 * Checks of the words on a page (issue 12, "Labels and units"): labels said twice, internal
 * field names, and page titles with doubled or dangling punctuation. Pure functions of text, so
 * the end-to-end crawl and the unit tests share them. Common practice, no source.
 */

const words = (s: string) => s.toLowerCase().match(/[\p{L}\p{N}]+/gu) ?? [];

/** Two words that are the same word, allowing an ending ("dose" and "dosed", "tank" and "tanks"). */
function sameWord(a: string, b: string): boolean {
  if (a === b) return true;
  if (a.length < 4 || b.length < 4) return false;
  const [short, long] = a.length <= b.length ? [a, b] : [b, a];
  return long.startsWith(short) && long.length - short.length <= 2;
}

/**
 * Labels said twice around a colon: "In the tank: In the tank", "Ammonia dose: Ammonia dosed: 2".
 * A label of one to four words before a colon whose words open the text after it again.
 */
export function doubledLabels(text: string): string[] {
  const found: string[] = [];
  const re = /([\p{L}][\p{L}\p{N} ]{1,40}?):\s+(?=([\p{L}][^\n]{0,60}))/gu;
  for (const m of text.matchAll(re)) {
    const before = words(m[1]).slice(-4);
    const after = words(m[2]);
    // Try every tail of the label (the label may follow other words on the line).
    for (let k = Math.min(before.length, 4); k >= 1; k--) {
      const label = before.slice(-k);
      // One word alone counts only when it is the whole label ("Nitrate: Nitrate (NO3)").
      if (k === 1 && (before.length > 1 || label[0].length < 4)) continue;
      if (label.every((w, i) => after[i] !== undefined && sameWord(w, after[i]))) {
        found.push(`${m[1].trim()}: ${m[2].slice(0, 40)}`);
        break;
      }
    }
  }
  return found;
}

/** Internal names on screen: camelCase identifiers ("takenAt", "fullAtFraction"). */
export function internalNames(text: string): string[] {
  return [...new Set(text.match(/\b[a-z]+(?:[A-Z][a-z0-9]+)+\b/g) ?? [])];
}

/**
 * What is wrong with a page title, or [] when nothing is: doubled separators ("— —", "· ·",
 * ": —"), two full stops (not an ellipsis), an empty part, or a separator at either end.
 */
export function titleProblems(title: string): string[] {
  const problems: string[] = [];
  const t = title.trim();
  if (!t) return ["empty title"];
  if (/[—–·:|,]\s*[—–·:|]/.test(t)) problems.push("doubled separator");
  if (/(?<!\.)\.\.(?!\.)/.test(t)) problems.push("two full stops");
  if (/^[—–·:|,.]/.test(t) || /[—–·:|,]$/.test(t)) problems.push("separator at an end");
  if (/\s{2,}/.test(t)) problems.push("empty part");
  if (/\b(undefined|null|NaN)\b/.test(t)) problems.push("missing value");
  return problems;
}
