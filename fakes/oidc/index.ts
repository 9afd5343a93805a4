export { demoAccounts, type FakeAccount } from './demo-accounts.js';
export { startOidcFake, type OidcFake, type OidcFakeOptions } from './oidc-fake.js';
export { CookieJar, walkSignIn } from './sign-in-walk.js';
