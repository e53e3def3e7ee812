import { z } from 'zod'
import { LOCALES, ROLES } from '../types/roles'
import { textField } from './text'

// Shared by the forms and the routes, so the browser and the server say the same thing.
export const PASSWORD_MIN_LENGTH = 12
// An upper bound keeps hashing cost per request small; passphrases of several words fit easily.
export const PASSWORD_MAX_LENGTH = 256

// Very common passwords of 12 or more characters (shorter ones fail the length rule anyway), compared
// without case; the first ones people try when guessing.
const COMMON_PASSWORDS = new Set([
  '123456789012', '1234567890123', '12345678901234', '123456789123', '111111111111', '000000000000',
  '123123123123', 'password1234', 'password12345', 'password123!', 'passwordpassword', 'qwertyuiop12',
  'qwertyuiop123', 'qwerty123456', '1q2w3e4r5t6y', '1qaz2wsx3edc', 'abcdefghijkl', 'abc123abc123',
  'iloveyou1234', 'letmein12345', 'welcome12345', 'welcome123456', 'administrator', 'changeme1234',
  'trustno1trustno1', 'football1234', 'baseball1234', 'sunshine1234', 'princess1234', 'monkey123456',
  'dragon123456', 'superman1234', 'qazwsxedcrfv', 'asdfghjkl123', 'zxcvbnm12345', 'brinkwater123', 'brinkwater2026',
])

const COMMON_PASSWORD
  = 'This password is on a list of very common passwords. Choose one that is harder to guess, such as three or four unrelated words.'
const CONTAINS_ADDRESS = 'Do not use your e-mail address (or its part before the @) in your password.'

/** A new password that contains the address's part before the @ is refused; the API and forms share this. */
export function passwordAddressProblem(password: string, email: string): string | null {
  const local = email.split('@')[0]?.toLowerCase()
  return local && local.length >= 3 && password.toLowerCase().includes(local) ? CONTAINS_ADDRESS : null
}

export const emailField = z.string({ error: 'Enter an e-mail address.' })
  .trim().toLowerCase()
  .pipe(z.email({ error: 'Enter a valid e-mail address, like name@example.org.' }))

export const passwordField = z.string({ error: 'Enter a password.' })
  .min(PASSWORD_MIN_LENGTH, { error: `Use at least ${PASSWORD_MIN_LENGTH} characters.` })
  .max(PASSWORD_MAX_LENGTH, { error: `Use at most ${PASSWORD_MAX_LENGTH} characters.` })
  .refine(password => !COMMON_PASSWORDS.has(password.toLowerCase()), { error: COMMON_PASSWORD })

export const nameField = textField({ error: 'Enter a name.' }).trim()
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
}).superRefine((input, ctx) => {
  // One thing to fix at a time: the address rule speaks once the password meets the others.
  const problem = passwordField.safeParse(input.password).success && passwordAddressProblem(input.password, input.email)
  if (problem) ctx.addIssue({ code: 'custom', path: ['password'], message: problem })
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

export type CreateUserInput = z.infer<typeof CreateUserSchema>
export type UpdateUserInput = z.infer<typeof UpdateUserSchema>
