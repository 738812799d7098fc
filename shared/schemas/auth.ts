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

export const csrfSchema = z.object({ token: z.string() })

/** A person's own settings: units for room dimensions, and whether non-essential e-mails are welcome. */
export const preferencesSchema = z.object({
  units: z.enum(['metric', 'imperial']),
  emailOptional: z.boolean(),
})
export type Preferences = z.infer<typeof preferencesSchema>
export const updatePreferencesSchema = preferencesSchema.partial().refine((v) => Object.keys(v).length > 0, 'nothing to change')
