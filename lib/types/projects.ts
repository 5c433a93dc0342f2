/** Shapes shared by lib/data/projects.ts and the client components that show them. */

export interface ProjectFile {
  id: number;
  purpose: "sketch" | "photo";
  fileName: string;
  mimeType: string;
  caption: string | null;
  tag: string | null;
}
