let addresses = 0;

/**
 * A browser's cookies, enough for iron-session's get/set through `cookies()` of next/headers, and
 * the client address its requests come from (`headers()` answers it as X-Forwarded-For). Each jar
 * gets an address of its own (IPv6 documentation prefix) unless one is given.
 */
export class CookieJar {
  private values = new Map<string, string>();

  constructor(readonly address = `2001:db8::${(++addresses).toString(16)}`) {}

  /** Another browser holding copies of these cookies (a stolen or copied cookie). */
  clone(): CookieJar {
    const copy = new CookieJar(this.address);
    for (const [k, v] of this.values) copy.values.set(k, v);
    return copy;
  }

  get(name: string): { name: string; value: string } | undefined {
    const value = this.values.get(name);
    return value === undefined ? undefined : { name, value };
  }

  set(nameOrOptions: string | { name: string; value: string; maxAge?: number }, value?: string, options?: { maxAge?: number }): void {
    const name = typeof nameOrOptions === 'string' ? nameOrOptions : nameOrOptions.name;
    const v = typeof nameOrOptions === 'string' ? (value ?? '') : nameOrOptions.value;
    const maxAge = typeof nameOrOptions === 'string' ? options?.maxAge : nameOrOptions.maxAge;
    if (maxAge === 0 || v === '') this.values.delete(name);
    else this.values.set(name, v);
  }

  delete(name: string): void {
    this.values.delete(name);
  }

  has(name: string): boolean {
    return this.values.has(name);
  }

  getAll(): { name: string; value: string }[] {
    return [...this.values].map(([name, value]) => ({ name, value }));
  }
}

let current = new CookieJar();

/** The jar that `cookies()` answers with: switch it to act as another browser. */
export function useJar(jar: CookieJar): CookieJar {
  current = jar;
  return jar;
}

export function currentJar(): CookieJar {
  return current;
}
