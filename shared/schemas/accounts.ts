import { z } from 'zod'
import { emailField, nameField, passwordField, roleField } from './users'

export const InvitationSchema = z.object({
  email: emailField,
  name: nameField,
  role: roleField,
  organisationId: z.uuid({ error: 'Choose an organisation.' }),
  language: z.enum(['en', 'es'], { error: 'Choose English (en) or Spanish (es).' }).default('en'),
})

const token = z
  .string({ error: 'The link has no token.' })
  .regex(/^[\w-]{20,64}$/, { error: 'This link is not valid: copy the whole link from the e-mail.' })

export const AcceptInvitationSchema = z.object({ token, password: passwordField })
export const ResetRequestSchema = z.object({ email: emailField, language: z.enum(['en', 'es']).default('en') })
export const ResetCompleteSchema = z.object({ token, password: passwordField })
export const TokenQuery = z.object({ token })
