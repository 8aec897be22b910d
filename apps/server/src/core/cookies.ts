/**
 * The value of one cookie in a Cookie header (the first, if it comes twice), percent-decoded; for
 * the cookies read on every request, without parsing all the others.
 */
export function cookieValue(header: string | undefined, name: string): string | undefined {
  if (!header) return undefined;
  let at = header.indexOf(`${name}=`);
  // Only at the start of a cookie pair ("x-trabeate.sid=" is another cookie).
  while (at > 0 && header[at - 1] !== ' ' && header[at - 1] !== ';') at = header.indexOf(`${name}=`, at + 1);
  if (at < 0) return undefined;
  const start = at + name.length + 1;
  const end = header.indexOf(';', start);
  const raw = header.slice(start, end < 0 ? undefined : end).trim();
  try {
    return decodeURIComponent(raw);
  } catch {
    return undefined;
  }
}
