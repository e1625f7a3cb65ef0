// The words of the e-mails Rejectra sends.
import { roleLabels, type Role } from '../../shared/schemas/users';
import type { OutgoingMessage } from './mailer';

const signature = '\n\n-- \nRejectra · common-mode rejection, measured and predicted\n';

export function invitationMessage(options: {
  to: string;
  name: string;
  role: Role;
  invitedBy: string;
  link: string;
  expiresAt: Date;
}): OutgoingMessage {
  return {
    to: options.to,
    subject: 'Your Rejectra account is ready to set up',
    text:
      `Hello ${options.name},\n\n` +
      `${options.invitedBy} has added you to Rejectra as ${roleLabels[options.role].toLowerCase()}.\n` +
      `Choose your password here (the link works once, until ${options.expiresAt.toUTCString()}):\n\n` +
      `${options.link}\n\n` +
      'If you were not expecting this, ignore this message.' +
      signature,
  };
}

export function passwordResetMessage(options: { to: string; name: string; link: string; expiresAt: Date }): OutgoingMessage {
  return {
    to: options.to,
    subject: 'Reset your Rejectra password',
    text:
      `Hello ${options.name},\n\n` +
      'Someone asked to reset the password of your Rejectra account.\n' +
      `Choose a new one here (the link works once, until ${options.expiresAt.toUTCString()}):\n\n` +
      `${options.link}\n\n` +
      'If it was not you, ignore this message: your password stays as it is.' +
      signature,
  };
}
