/** What other features use of revisions: the review and edit mutations, the status chip, the note field and the template dialog. */
export { useAddRevisionComment } from "./api/add-revision-comment";
export { useApproveRevision } from "./api/approve-revision";
export { useCreateDraftFrom } from "./api/create-draft";
export { useLatestRevision } from "./api/get-latest-revision";
export { useReturnRevision } from "./api/return-revision";
export { useSubmitRevision } from "./api/submit-revision";
export { useUpdateRevision, type UpdateRevisionInput } from "./api/update-revision";
export { RevisionStatusChip, STATUS_LABEL } from "./components/revision-status-chip";
export { RevisionChanges } from "./components/revision-changes";
export { NoteDialog } from "./components/note-dialog";
export { NoteField } from "./components/note-field";
export { SubmitDialog } from "./components/submit-dialog";
export { TemplateDialog } from "./components/template-dialog";
