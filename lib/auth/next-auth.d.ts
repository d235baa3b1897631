import "next-auth";

declare module "next-auth" {
  interface Session {
    userId: string | null;
    labId: string | null;
    role: string | null;
  }
}
