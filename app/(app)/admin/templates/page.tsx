import { TemplateAdmin } from "@/components/procedures/template-admin";

export const metadata = { title: "Procedure templates" };

export default function TemplatesAdminPage() {
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">Procedure templates</h1>
      <TemplateAdmin />
    </>
  );
}
