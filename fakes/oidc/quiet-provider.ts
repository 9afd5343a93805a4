import type { Configuration, Provider } from 'oidc-provider';

// oidc-provider 9 supports Node 22 and later but works on Node 20; it says so on every import.
// The in-memory adapter is what this fake is meant to use, so its warning is noise here too.
const expectedNotices = [
  'oidc-provider WARNING: Unsupported runtime',
  'oidc-provider WARNING: a quick start development-only in-memory adapter',
];

function isExpectedNotice(args: unknown[]): boolean {
  const [first] = args;
  return typeof first === 'string' && expectedNotices.some((notice) => first.includes(notice));
}

async function withoutExpectedNotices<T>(work: () => T | Promise<T>): Promise<T> {
  const warn = console.warn;
  console.warn = (...args: unknown[]) => {
    if (!isExpectedNotice(args)) {
      warn(...args);
    }
  };
  try {
    return await work();
  } finally {
    console.warn = warn;
  }
}

let providerModule: Promise<typeof import('oidc-provider')> | undefined;

/**
 * Creates an oidc-provider instance, keeping the two notices this fake expects off the console.
 * The module is imported here, not at the top of a file, so that its import-time notice can be
 * filtered too.
 */
export async function createQuietProvider(
  issuer: string,
  configuration: Configuration,
): Promise<Provider> {
  providerModule ??= withoutExpectedNotices(() => import('oidc-provider'));
  const { default: ProviderClass } = await providerModule;
  return withoutExpectedNotices(() => new ProviderClass(issuer, configuration));
}
