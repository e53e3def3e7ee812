import { z } from 'zod'
import { LOCALES, ROLES } from '../types/roles'

// Shared by the forms and the routes, so the browser and the server say the same thing.
export const PASSWORD_MIN_LENGTH = 12

export const emailField = z.string({ error: 'Enter an e-mail address.' })
  .trim().toLowerCase()
  .pipe(z.email({ error: 'Enter a valid e-mail address, like name@example.org.' }))

export const passwordField = z.string({ error: 'Enter a password.' })
  .min(PASSWORD_MIN_LENGTH, { error: `Use at least ${PASSWORD_MIN_LENGTH} characters.` })
  .max(200, { error: 'Use at most 200 characters.' })

export const nameField = z.string({ error: 'Enter a name.' }).trim()
  .min(1, { error: 'Enter a name.' }).max(120, { error: 'Use at most 120 characters.' })

export const roleField = z.enum(ROLES, { error: `Choose one of: ${ROLES.join(', ')}.` })

export const SignInSchema = z.object({
  email: emailField,
  // No length rule here: the answer to a wrong password must not hint at the policy.
  password: z.string({ error: 'Enter your password.' }).min(1, { error: 'Enter your password.' }),
})

export const CreateUserSchema = z.object({
  email: emailField,
  name: nameField,
  role: roleField,
  organisationId: z.uuid({ error: 'Choose an organisation.' }),
  password: passwordField,
})

export const UpdateUserSchema = z.object({
  name: nameField.optional(),
  role: roleField.optional(),
  disabled: z.boolean({ error: 'disabled must be true or false.' }).optional(),
}).refine(patch => Object.values(patch).some(value => value !== undefined), {
  error: 'Send at least one of name, role or disabled.',
})

export const PreferencesSchema = z.object({
  locale: z.enum(LOCALES, { error: `Choose one of: ${LOCALES.join(', ')}.` }),
})

export const IdParams = z.object({ id: z.uuid() })

export type CreateUserInput = z.infer<typeof CreateUserSchema>
export type UpdateUserInput = z.infer<typeof UpdateUserSchema>
