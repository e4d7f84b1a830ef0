def main():
    print("ok")
