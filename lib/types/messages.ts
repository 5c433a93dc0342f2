/** Shapes shared by lib/data/messages.ts and the client components that show them. */

export interface Message {
  id: number;
  mine: boolean;
  senderName: string;
  bodyMd: string;
  createdAt: string;
}
