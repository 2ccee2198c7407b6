/** SHA-256 of text (UTF-8), hex, by the platform's Web Crypto; null where it is unavailable (no secure context). */
export async function sha256Text(text: string): Promise<string | null> {
  const subtle = globalThis.crypto?.subtle;
  if (!subtle) return null;
  const digest = await subtle.digest('SHA-256', new TextEncoder().encode(text));
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}
