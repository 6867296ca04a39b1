/**
 * The texts of the e-mails sent to panelists: the invitation (with the private link), the
 * notice that a round is open, and the reminder before the deadline. Pure functions of what
 * they are given. Each message is for one person and names only that person and the panel:
 * never another panelist, how many there are, who has answered, or any pseudonym (THREATS.md,
 * "E-mail to panelists"). Plain text, so it reads the same in every mail client; the link is on
 * a line of its own, so a client does not glue punctuation to it.
 */
import { formatDateTime } from "../ui/format";

export type MessageKind = "invitation" | "round-opened" | "reminder";

export interface Message {
  readonly kind: MessageKind;
  /** One recipient: "Name <address>". */
  readonly to: string;
  readonly subject: string;
  readonly text: string;
}

export interface Recipient {
  readonly name: string;
  readonly email: string;
}

/** "Name <address>" with the characters a header cannot hold in a display name removed. */
export function mailbox(r: Recipient): string {
  const name = r.name.replace(/[\r\n"<>\\]/g, " ").replace(/\s+/g, " ").trim();
  return name ? `"${name}" <${r.email}>` : r.email;
}

/** One line of header text (no line breaks; at most 150 characters). */
function oneLine(text: string): string {
  const line = text.replace(/[\r\n]+/g, " ").trim();
  return line.length > 150 ? `${line.slice(0, 149)}…` : line;
}

/**
 * The invitation: the panel, what is asked of the panelist, and their private link.
 * @param link the full address of the panelist's page (site + /p/<token>)
 * @param expiresAt when the link stops working
 */
export function invitationMessage(r: Recipient, panelTitle: string, link: string, expiresAt: string | Date): Message {
  return {
    kind: "invitation",
    to: mailbox(r),
    subject: oneLine(`Invitation to the expert panel "${panelTitle}"`),
    text: [
      `Dear ${r.name},`,
      "",
      `You are invited to give your estimates to the expert panel "${panelTitle}".`,
      "The panel answers in rounds; after each round you see how the panel's answers spread, anonymously, and may revise yours.",
      "Nobody on the panel sees your name next to your answers.",
      "",
      "Your private link (do not pass it on; it is how the panel knows your answers are yours):",
      "",
      link,
      "",
      `The link works until ${formatDateTime(expiresAt)}. Keep this e-mail: later notices about the panel refer to this link.`,
    ].join("\n"),
  };
}

/** The notice that round `roundNumber` is open, with its deadline if it has one. */
export function roundOpenedMessage(r: Recipient, panelTitle: string, roundNumber: number, deadline: string | Date | null): Message {
  return {
    kind: "round-opened",
    to: mailbox(r),
    subject: oneLine(`Round ${roundNumber} of "${panelTitle}" is open`),
    text: [
      `Dear ${r.name},`,
      "",
      `Round ${roundNumber} of the expert panel "${panelTitle}" is open${deadline ? ` until ${formatDateTime(deadline)}` : ""}.`,
      roundNumber > 1 ? "You can see how the panel answered in the last round and keep or revise your answers." : "You can give your answers now.",
      "",
      "Use the private link from your invitation e-mail. If you have lost it, ask the organiser for a new one.",
    ].join("\n"),
  };
}

/** The reminder to someone who has not answered every question of the open round. */
export function reminderMessage(r: Recipient, panelTitle: string, roundNumber: number, deadline: string | Date | null): Message {
  return {
    kind: "reminder",
    to: mailbox(r),
    subject: oneLine(`Reminder: round ${roundNumber} of "${panelTitle}"${deadline ? ` closes ${formatDateTime(deadline)}` : ""}`),
    text: [
      `Dear ${r.name},`,
      "",
      `Round ${roundNumber} of the expert panel "${panelTitle}" is open${deadline ? ` until ${formatDateTime(deadline)}` : ""}, and some of its questions still wait for your answer.`,
      "",
      "Use the private link from your invitation e-mail. If you have lost it, ask the organiser for a new one.",
    ].join("\n"),
  };
}
