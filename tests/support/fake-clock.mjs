// Loaded with `node --import` into a test server: moves its clock to January of
// BRINKWATER_FAKE_YEAR (keeping time running), so a test can show that results do not
// depend on the year they are computed in.
const year = Number(process.env.BRINKWATER_FAKE_YEAR)
if (Number.isInteger(year)) {
  const RealDate = Date
  const shift = Date.UTC(year, 0, 15) - RealDate.now()
  class ShiftedDate extends RealDate {
    constructor(...args) {
      if (args.length === 0) super(RealDate.now() + shift)
      else super(...args)
    }

    static now() { return RealDate.now() + shift }
  }
  globalThis.Date = ShiftedDate
}
