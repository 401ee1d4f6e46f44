import nodemailer from 'nodemailer'
import type { Transporter, SendMailOptions } from 'nodemailer'

let transporter: Transporter | undefined

/** One SMTP transport per process, from SMTP_URL (the local fake under `npm start` / `npm test`). */
export function mailer(): Transporter {
  if (!transporter) {
    const url = process.env.SMTP_URL
    if (!url) throw new Error('SMTP_URL is not set')
    // Short timeouts: fail fast when the relay is down instead of holding a request for minutes.
    transporter = nodemailer.createTransport({ url, connectionTimeout: 5_000, greetingTimeout: 5_000, socketTimeout: 20_000 } as nodemailer.TransportOptions,
      { from: process.env.MAIL_FROM ?? 'Tautline <no-reply@tautline.test>' })
  }
  return transporter
}

export function sendMail(message: SendMailOptions) {
  return mailer().sendMail({ from: process.env.MAIL_FROM ?? 'Tautline <no-reply@tautline.test>', ...message })
}

export function appUrl(path: string) {
  return new URL(path, process.env.APP_URL ?? 'http://127.0.0.1:3000').toString()
}

/** True when the relay accepts a connection and greets us. */
export async function mailReachable() {
  try {
    return await mailer().verify()
  }
  catch {
    return false
  }
}
