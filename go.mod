module skysheet

go 1.26
