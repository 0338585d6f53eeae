/** Rows of the classes feature, as the database returns them (types only). */
import type { classes, lessonCopies, lessons } from "~/db/schema";

export type ClassRow = typeof classes.$inferSelect;
export type LessonRow = typeof lessons.$inferSelect;
export type LessonCopyRow = typeof lessonCopies.$inferSelect;
