/**
 * Reads the text file chosen in a file input (`read` is the input's change handler) and hands its text
 * and name to `use`. A file larger than `maxBytes` is not read and sets `tooLarge`, for the form to say so.
 */
export function useTextFile(use: (text: string, name: string) => void, maxBytes = Number.POSITIVE_INFINITY) {
  const tooLarge = ref(false)
  async function read(event: Event) {
    const file = (event.target as HTMLInputElement).files?.[0]
    tooLarge.value = !!file && file.size > maxBytes
    if (file && !tooLarge.value) use(await file.text(), file.name)
  }
  return { read, tooLarge }
}
