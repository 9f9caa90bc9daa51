/** What every section of the study settings form gets: the values as typed, a setter and the errors by field. */
import type { FormErrors, StudyFormValues } from "../lib/study-form";

export interface SettingsSectionProps {
  v: StudyFormValues;
  set: <K extends keyof StudyFormValues>(key: K, value: StudyFormValues[K]) => void;
  errors: FormErrors;
}
