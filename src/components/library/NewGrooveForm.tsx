/** Creates a groove (title, description, tags, sharing) with an empty first version, then opens it in the editor. */
import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { useCreateGroove } from "../../lib/client/queries";
import { Field, FormMessage, applyServerErrors, buttonClass, inputClass, quietButtonClass } from "../account/fields";

export const detailsSchema = z.object({
  title: z.string().trim().min(1, "Enter a title.").max(120, "Use at most 120 characters."),
  description: z.string().trim().max(2000, "Use at most 2,000 characters."),
  tags: z.string().max(600),
  visibility: z.enum(["private", "link", "public"]),
});
export type DetailsValues = z.infer<typeof detailsSchema>;
export const splitTags = (s: string) => s.split(",").map((t) => t.trim()).filter(Boolean);

export default function NewGrooveForm({ onCancel }: { onCancel: () => void }) {
  const form = useForm<DetailsValues>({ resolver: zodResolver(detailsSchema), defaultValues: { title: "", description: "", tags: "", visibility: "private" } });
  const create = useCreateGroove();
  const [formError, setFormError] = useState("");
  const { errors, isSubmitting } = form.formState;
  const onSubmit = form.handleSubmit(async (v) => {
    setFormError("");
    try {
      const g = await create.mutateAsync({ title: v.title, description: v.description, tags: splitTags(v.tags), visibility: v.visibility });
      location.assign(`/grooves/${g.id}/edit`);
    } catch (e) {
      setFormError(applyServerErrors(form, e, ["title", "description", "tags", "visibility"]));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 rounded-lg border border-line bg-surface-raised p-4 sm:grid-cols-2" aria-label="New groove">
      {formError && <div className="sm:col-span-2"><FormMessage>{formError}</FormMessage></div>}
      <Field id="new-title" label="Title" error={errors.title?.message}>
        <input id="new-title" className={inputClass} aria-invalid={Boolean(errors.title)} {...form.register("title")} />
      </Field>
      <Field id="new-tags" label="Tags" error={errors.tags?.message} hint="Separated by commas, e.g. funk, half time">
        <input id="new-tags" className={inputClass} {...form.register("tags")} />
      </Field>
      <Field id="new-description" label="Description" error={errors.description?.message}>
        <textarea id="new-description" rows={2} className={inputClass} {...form.register("description")} />
      </Field>
      <Field id="new-visibility" label="Who can see it" error={errors.visibility?.message}>
        <select id="new-visibility" className={inputClass} {...form.register("visibility")}>
          <option value="private">Only me and the people I invite</option>
          <option value="link">Anyone with the link</option>
          <option value="public">Everyone (listed in the library)</option>
        </select>
      </Field>
      <div className="flex gap-2 sm:col-span-2">
        <button type="submit" className={buttonClass} disabled={isSubmitting}>Create and open</button>
        <button type="button" className={quietButtonClass} onClick={onCancel}>Cancel</button>
      </div>
    </form>
  );
}
