import { z } from 'zod';
import { normaliseOrcid } from './orcid.ts';

// Input shapes for accounts, API tokens, administration and lab membership: one schema each,
// used by the JSON API and the pages' forms alike. Strict: an unknown field is refused by name.

export const email = z
  .string()
  .trim()
  .toLowerCase()
  .max(320)
  .pipe(z.email({ message: 'must be an e-mail address' }));
// Password rules proper (length, common passwords, byte limit) are checked by the server.
const password = z.string().min(1, 'is required').max(1024);

export const signUpInput = z.strictObject({
  email,
  password,
  name: z.string().trim().max(200).optional(),
});

export const emailInput = z.strictObject({ email });

export const tokenInput = z.strictObject({ token: z.string().min(10).max(200) });

export const resetPasswordInput = z.strictObject({ token: z.string().min(10).max(200), password });

export const changePasswordInput = z.strictObject({
  currentPassword: password,
  newPassword: password,
});

const optionalText = (max: number) =>
  z
    .string()
    .trim()
    .max(max)
    .transform((s) => (s === '' ? null : s))
    .nullable();

export const profileInput = z.strictObject({
  name: optionalText(200).optional(),
  affiliation: optionalText(300).optional(),
  orcid: z
    .string()
    .trim()
    .max(60)
    .nullable()
    .optional()
    .transform((s, ctx) => {
      if (s === undefined) return undefined;
      if (s === null || s === '') return null;
      const id = normaliseOrcid(s);
      if (!id) {
        ctx.addIssue({
          code: 'custom',
          message:
            'is not a valid ORCID iD (form 0000-0000-0000-000X, with a correct check character)',
        });
        return z.NEVER;
      }
      return id;
    }),
});

export const MAX_TOKEN_DAYS = 365;
export const apiTokenInput = z.strictObject({
  name: z.string().trim().min(1, 'is required').max(100),
  scopes: z
    .array(z.enum(['read', 'write']))
    .min(1, 'choose at least one scope')
    .transform((s) => [...new Set(s)]),
  expiresInDays: z.coerce.number().int().min(1).max(MAX_TOKEN_DAYS).default(90),
});

export const userChangeInput = z
  .strictObject({
    role: z.enum(['reader', 'contributor', 'curator', 'admin']).optional(),
    disabled: z.boolean().optional(),
  })
  .refine((v) => v.role !== undefined || v.disabled !== undefined, {
    message: 'give role or disabled',
  });

export const memberAddInput = z.strictObject({
  email,
  role: z.enum(['member', 'manager']).default('member'),
});

export const memberChangeInput = z.strictObject({
  role: z.enum(['member', 'manager']),
});

export const labCreateInput = z.strictObject({
  slug: z
    .string()
    .regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, 'lower-case letters, digits and single hyphens')
    .max(60),
  name: z.string().trim().min(2).max(200),
});

/** A form naming one object by id (revoke this token, remove this member). */
export const idInput = z.strictObject({ id: z.string().min(1).max(100) });
