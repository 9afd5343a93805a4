import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { projectRoot } from '../server/project-paths';
import { rewriteSharedImports } from './use-shared-alias';

describe('rewriteSharedImports', () => {
  it('should write an import that climbs out to shared/ through the alias', () => {
    const file = path.join(projectRoot, 'web/app/core/auth/current-user.ts');
    const source = [
      "import type { Me } from '../../../../shared/api/me';",
      "const lazy = import('../../../../shared/api/me');",
      "export { roles } from '../../../../shared/api/roles';",
    ].join('\n');
    expect(rewriteSharedImports(source, file)).toBe(
      [
        "import type { Me } from '@shared/api/me';",
        "const lazy = import('@shared/api/me');",
        "export { roles } from '@shared/api/roles';",
      ].join('\n'),
    );
  });

  it('should leave a relative import that stays outside shared/ as it is', () => {
    const file = path.join(projectRoot, 'web/app/core/auth/current-user.ts');
    const source =
      "import { parsedWith } from '../parse';\nimport { x } from '../../shared-things/x';";
    expect(rewriteSharedImports(source, file)).toBe(source);
  });
});
