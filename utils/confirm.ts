/** The confirmation dialog (components/ui/UiConfirm.vue) as a page holds it by `useTemplateRef<ConfirmDialog>`. */
export interface ConfirmDialog {
  ask: (question: { title: string, body: string, confirm: string, tone?: 'danger' | 'primary' }) => Promise<boolean>
}
