"use client";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState, type FormEvent, type ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { sendJson } from "@/lib/queries/assemblies";
import { queryKeys } from "@/lib/queries/keys";
import { fieldErrorsOf, formValues, Select, TextArea, withoutEmpty } from "./form-bits";

/** A small form that posts its fields, shows field errors beside them and refreshes the assembly. */
function useFormPost(url: string, optional: string[] = []) {
  const qc = useQueryClient();
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const m = useMutation({
    mutationFn: (v: Record<string, string>) => sendJson<unknown>(url, "POST", withoutEmpty(v, optional)),
    onSuccess: async () => {
      setErrors({});
      await Promise.all([qc.invalidateQueries({ queryKey: queryKeys.assemblies.all }), qc.invalidateQueries({ queryKey: queryKeys.parts.all })]);
    },
    onError: (e) => setErrors(fieldErrorsOf(e)),
  });
  const onSubmit = (e: FormEvent<HTMLFormElement>) => {
    e.preventDefault();
    const form = e.currentTarget;
    m.mutate(formValues(form), { onSuccess: () => form.reset() });
  };
  return { m, errors, onSubmit };
}

function Shell({ title, onSubmit, m, errors, children, submit }: { title: string; onSubmit: (e: FormEvent<HTMLFormElement>) => void; m: { isPending: boolean; isError: boolean; isSuccess: boolean; error: Error | null }; errors: Record<string, string[]>; children: ReactNode; submit: string }) {
  return (
    <form onSubmit={onSubmit} noValidate aria-label={title} className="flex flex-col gap-3 rounded-lg border border-rule bg-sheet p-4">
      <h3 className="font-semibold">{title}</h3>
      {m.isError && !Object.keys(errors).length ? <Notice tone="fail" title={m.error?.message} /> : null}
      {children}
      <div>
        <Button type="submit" disabled={m.isPending}>
          {m.isPending ? "Saving…" : submit}
        </Button>
      </div>
    </form>
  );
}

export function SubAssemblyForm({ parentId }: { parentId: number }) {
  const f = useFormPost("/api/assemblies");
  return (
    <Shell title="Add a sub-assembly" submit="Add sub-assembly" {...f}>
      <input type="hidden" name="parentId" value={parentId} />
      <Field label="Sub-assembly name" name="sub-name" errors={f.errors.name}>
        <TextInput id="sub-name" name="name" invalid={!!f.errors.name} />
      </Field>
    </Shell>
  );
}

export function PartForm({ assemblyId, defaults }: { assemblyId: number; defaults?: string }) {
  const f = useFormPost(`/api/assemblies/${assemblyId}/parts`, ["layerHeightMm", "walls", "infillPercent"]);
  return (
    <Shell title="Add a printed part" submit="Add part" {...f}>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Part name" name="part-name" errors={f.errors.name}>
          <TextInput id="part-name" name="name" invalid={!!f.errors.name} />
        </Field>
        <Field label="Quantity needed" name="part-quantity" errors={f.errors.quantity}>
          <TextInput id="part-quantity" name="quantity" type="number" min={1} defaultValue={1} invalid={!!f.errors.quantity} />
        </Field>
        <Field label="Material" name="part-material" errors={f.errors.material}>
          <TextInput id="part-material" name="material" defaultValue="PLA" invalid={!!f.errors.material} />
        </Field>
        <Field label="Colour" name="part-colour" errors={f.errors.colour}>
          <TextInput id="part-colour" name="colour" />
        </Field>
        <Field label="Layer height (mm)" name="part-layer" errors={f.errors.layerHeightMm} hint={defaults}>
          <TextInput id="part-layer" name="layerHeightMm" type="number" step="0.01" invalid={!!f.errors.layerHeightMm} />
        </Field>
        <Field label="Walls" name="part-walls" errors={f.errors.walls}>
          <TextInput id="part-walls" name="walls" type="number" invalid={!!f.errors.walls} />
        </Field>
        <Field label="Infill (%)" name="part-infill" errors={f.errors.infillPercent}>
          <TextInput id="part-infill" name="infillPercent" type="number" invalid={!!f.errors.infillPercent} />
        </Field>
      </div>
      <Field label="Notes" name="part-notes" errors={f.errors.notes}>
        <TextArea id="part-notes" name="notes" />
      </Field>
    </Shell>
  );
}

export function ItemForm({ assemblyId }: { assemblyId: number }) {
  const f = useFormPost(`/api/assemblies/${assemblyId}/items`, ["unitPriceCents", "dueDate"]);
  return (
    <Shell title="Add hardware or a part made elsewhere" submit="Add item" {...f}>
      <div className="grid gap-3 sm:grid-cols-2">
        <Field label="Kind" name="item-kind" errors={f.errors.kind}>
          <Select id="item-kind" name="kind" defaultValue="hardware">
            <option value="hardware">Bought hardware</option>
            <option value="made">Made elsewhere (laser-cut, machined…)</option>
          </Select>
        </Field>
        <Field label="Item name" name="item-name" errors={f.errors.name}>
          <TextInput id="item-name" name="name" invalid={!!f.errors.name} />
        </Field>
        <Field label="Item quantity" name="item-quantity" errors={f.errors.quantity}>
          <TextInput id="item-quantity" name="quantity" type="number" min={1} defaultValue={1} invalid={!!f.errors.quantity} />
        </Field>
        <Field label="Where to buy, or supplier" name="item-source" errors={f.errors.source}>
          <TextInput id="item-source" name="source" />
        </Field>
        <Field label="Unit price (cents)" name="item-price" errors={f.errors.unitPriceCents}>
          <TextInput id="item-price" name="unitPriceCents" type="number" min={0} invalid={!!f.errors.unitPriceCents} />
        </Field>
        <Field label="Due date" name="item-due" errors={f.errors.dueDate}>
          <TextInput id="item-due" name="dueDate" type="date" invalid={!!f.errors.dueDate} />
        </Field>
      </div>
    </Shell>
  );
}

export function ShareForm({ assemblyId }: { assemblyId: number }) {
  const f = useFormPost(`/api/assemblies/${assemblyId}/shares`);
  return (
    <Shell title="Share with a member" submit="Share" {...f}>
      <Field label="Member's e-mail" name="share-email" errors={f.errors.email}>
        <TextInput id="share-email" name="email" type="email" invalid={!!f.errors.email} />
      </Field>
      <Field label="Access" name="share-access" errors={f.errors.access} hint="Edit lets them change parts and items; only you share or delete.">
        <Select id="share-access" name="access" defaultValue="read">
          <option value="read">Read</option>
          <option value="edit">Edit</option>
        </Select>
      </Field>
    </Shell>
  );
}
