import { z } from 'zod'

export const roles = ['listener', 'advisor', 'supervisor'] as const
export const roleSchema = z.enum(roles)
export type Role = z.infer<typeof roleSchema>

export const emailSchema = z.string().trim().toLowerCase().email('enter a valid e-mail address').max(254)
export const passwordSchema = z
  .string()
  .min(12, 'use at least 12 characters')
  .max(200, 'use at most 200 characters')

export const loginSchema = z.object({
  email: emailSchema,
  password: z.string().min(1, 'enter your password').max(200),
})
export type LoginInput = z.infer<typeof loginSchema>

export const registerSchema = z.object({
  email: emailSchema,
  password: passwordSchema,
  name: z.string().trim().min(1, 'enter your name').max(120),
})
export type RegisterInput = z.infer<typeof registerSchema>

export const userSchema = z.object({
  id: z.string().uuid(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
})
export type User = z.infer<typeof userSchema>

/** GET /api/auth/session: who is signed in, answered 200 either way (null when nobody is), so a signed-out page has no failing request. */
export const sessionSchema = z.object({ user: userSchema.nullable() })
/** The id of the JSON element in the served page that carries this answer (server/middleware/client-page.ts writes it, src/api/auth.ts reads it). */
export const SESSION_ELEMENT_ID = 'rw-session'
export type Session = z.infer<typeof sessionSchema>

export const csrfSchema = z.object({ token: z.string() })

/** A person's own settings: units for room dimensions, and whether non-essential e-mails are welcome. */
export const preferencesSchema = z.object({
  units: z.enum(['metric', 'imperial']),
  emailOptional: z.boolean(),
})
export type Preferences = z.infer<typeof preferencesSchema>
export const updatePreferencesSchema = preferencesSchema.partial().refine((v) => Object.keys(v).length > 0, 'nothing to change')

/** A new password (change or reset): the same rules as at sign-up. */
export const newPasswordSchema = passwordSchema

/** Changing the password while signed in needs the current one. */
export const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, 'enter your current password').max(200),
    newPassword: newPasswordSchema,
  })
  .refine((v) => v.currentPassword !== v.newPassword, { message: 'choose a password different from the current one', path: ['newPassword'] })
export type ChangePasswordInput = z.infer<typeof changePasswordSchema>

/** "Forgot password?": the address to send a link to. The answer is the same whether or not it has an account. */
export const passwordResetRequestSchema = z.object({ email: emailSchema })
export type PasswordResetRequestInput = z.infer<typeof passwordResetRequestSchema>

/** Reset tokens are 32 random bytes, base64url (43 characters). */
export const passwordResetTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{43}$/, 'this link is incomplete; open it from the e-mail again')

export const passwordResetSchema = z.object({
  token: passwordResetTokenSchema,
  password: newPasswordSchema,
})
export type PasswordResetInput = z.infer<typeof passwordResetSchema>

/** The one answer to a reset request, for every address. */
export const passwordResetRequestedSchema = z.object({ message: z.string() })
