// The file a person picked in an <input type="file">, with the input cleared for the next pick.

/** The picked file (undefined when none); clears the input so the same file can be picked again. */
export function takePickedFile(e: Event): File | undefined {
  const input = e.target as HTMLInputElement;
  const file = input.files?.[0];
  input.value = '';
  return file;
}
