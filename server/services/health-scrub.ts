// The health route is public: an error text it shows must not name a person, a host or a credential.

/** Removes anything that could name a person, a host or a credential from an error text. */
export function scrubError(text: string) {
  return text
    .replace(/\b[\w+-]+:\/\/\S+/g, '[url]')
    .replace(/[\w.+-]+@[\w-]+(\.[\w-]+)*/g, '[address]')
    .replace(/\blocalhost(:\d+)?\b/gi, '[host]')
    .replace(/\b\d{1,3}(\.\d{1,3}){3}(:\d+)?\b/g, '[host]')
    .replace(/\[?(?:[0-9a-f]{0,4}:){2,7}[0-9a-f]{0,4}\]?(?::\d+)?/gi, '[host]')
    .replace(/\b(?=[\w-]*[a-z])[\w-]+(\.[\w-]+)+\b/gi, match => /^\d+(\.\d+)+$/.test(match) ? match : '[host]')
    .slice(0, 200)
}
