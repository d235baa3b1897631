import { SignUpForm } from "@/components/auth/sign-up-form";

export const metadata = { title: "Create a lab" };

export default function SignUpPage() {
  return <SignUpForm />;
}
